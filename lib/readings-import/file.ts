// The file as a whole before any row is read: its bytes decoded to text, whether it is
// CSV at all, its column separator and its header. What fails here fails the file.
import { parse } from "csv-parse/sync";
import { READING_IMPORT_LIMITS } from "@/lib/schemas/reading-import";

export const DELIMITERS = [",", ";", "\t"] as const;
export type Delimiter = (typeof DELIMITERS)[number];
export const DELIMITER_NAMES: Record<Delimiter, string> = { ",": "commas", ";": "semicolons", "\t": "tabs" };

export type CsvFile = {
  /** The text after the header line. */
  body: string;
  /** The header's line count (1 unless a name holds a line break). */
  headerLines: number;
  header: string[];
  delimiter: Delimiter;
  /** Lines after the header that hold anything: the readings the file claims. */
  dataLines: number;
};

export type FileProblem = { code: "bad_input" | "too_large"; message: string };
export type FileResult = ({ ok: true } & CsvFile) | ({ ok: false } & FileProblem);

const fail = (message: string, code: FileProblem["code"] = "bad_input"): FileResult => ({ ok: false, code, message });
const NOT_TEXT = "This is not a CSV file: it holds bytes that text never does. Export the readings from the thermometer's app as CSV and choose that file.";

/** Text from bytes: UTF-16 by its byte-order mark, else UTF-8, else Windows-1252 (older Windows exports). */
export function decodeText(bytes: Uint8Array): string {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  const start = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes.subarray(start));
  } catch {
    return new TextDecoder("windows-1252").decode(bytes.subarray(start));
  }
}

/** How often each separator appears in a line outside quotes. */
function separatorCounts(line: string): Record<Delimiter, number> {
  const counts: Record<Delimiter, number> = { ",": 0, ";": 0, "\t": 0 };
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch in counts) counts[ch as Delimiter]++;
  }
  return counts;
}

const VALUE_RE = /^[-+−]?[\d.,:/ T+Z-]+$/;

/**
 * The file checked as CSV: not empty, text, a separator, a header naming the columns,
 * and within the size and row limits. With `partial`, the bytes are the file's start
 * (for the form's guesses) and the row limit is not applied.
 */
export function readCsvFile(bytes: Uint8Array, { partial = false } = {}): FileResult {
  if (bytes.length > READING_IMPORT_LIMITS.maxBytes) {
    return fail(`The file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; import at most ${READING_IMPORT_LIMITS.maxBytes / 1024 / 1024} MB at a time (split it by date).`, "too_large");
  }
  const text = decodeText(bytes);
  if (text.trim() === "") return fail("The file is empty.");
  // Text holds no NUL or other control characters besides tab, line ends and form feed.
  if (/[\u0000-\u0008\u000e-\u001f\u007f]/.test(text.slice(0, 1_000_000)) || /\u0000/.test(text)) return fail(NOT_TEXT);

  const start = text.search(/\S/);
  const firstEnd = text.indexOf("\n", start);
  const firstLine = text.slice(start, firstEnd === -1 ? undefined : firstEnd).replace(/\r$/, "");
  const counts = separatorCounts(firstLine);
  const delimiter = (["\t", ";", ","] as const).reduce((best, d) => (counts[d] > counts[best] ? d : best), "\t" as Delimiter);
  if (counts[delimiter] === 0) {
    return fail("This is not a CSV file Cloche can read: its first line has no commas, semicolons or tabs between columns. The first line should name the columns, e.g. Time;Temperature;Humidity.");
  }

  let header: string[];
  let headerLines: number;
  try {
    const [record] = parse(text.slice(start), { delimiter, to_line: 1, relax_column_count: true, trim: true, info: true }) as unknown as { record: string[]; info: { lines: number } }[];
    header = record?.record ?? [];
    headerLines = record?.info.lines ?? 1;
  } catch {
    return fail("The first line cannot be read as CSV: check for a stray quote mark.");
  }
  const named = header.filter((h) => h !== "");
  if (named.length < 2 || named.every((h) => VALUE_RE.test(h))) {
    return fail("The first line should name the columns (e.g. Time, Temperature, Humidity); it holds values instead. Add a header line, or export the file with one.");
  }

  // The body starts after the header's line(s).
  let at = start;
  for (let n = 0; n < headerLines; n++) {
    const next = text.indexOf("\n", at);
    at = next === -1 ? text.length : next + 1;
  }
  const body = text.slice(at);
  const dataLines = countLines(body);
  if (dataLines === 0) return fail("The file has a header but no readings.");
  if (!partial && dataLines > READING_IMPORT_LIMITS.maxRows) {
    return fail(
      `The file holds ${dataLines.toLocaleString("en-GB")} lines of readings; import at most ${READING_IMPORT_LIMITS.maxRows.toLocaleString("en-GB")} at a time (split it by date).`,
      "too_large",
    );
  }
  return { ok: true, body, headerLines, header, delimiter, dataLines };
}

/** Lines holding anything but white space. */
export function countLines(text: string): number {
  let n = 0;
  let from = 0;
  while (from < text.length) {
    let end = text.indexOf("\n", from);
    if (end === -1) end = text.length;
    for (let i = from; i < end; i++) {
      const c = text.charCodeAt(i);
      if (c !== 32 && c !== 13 && c !== 9) {
        n++;
        break;
      }
    }
    from = end + 1;
  }
  return n;
}
