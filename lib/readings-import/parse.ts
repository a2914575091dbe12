// A thermometer app's CSV read row by row into per-minute summaries, with every row
// that cannot be taken named by its line and why. The same reading serves the preview
// and the import, so what the preview promised is what the import writes.
import { parse } from "csv-parse/sync";
import { fToC } from "@/lib/units";
import { READING_IMPORT_LIMITS, type ReadingImportOptions } from "@/lib/schemas/reading-import";
import type { CsvFile } from "./file";
import { DELIMITER_NAMES } from "./file";
import { readTime } from "./formats";
import { zoneReader } from "./zone";

/** The range a greenhouse or outside sensor can plausibly read, °C. */
export const TEMPERATURE_RANGE_C = { min: -50, max: 70 } as const;
/** Lines parsed between progress reports (and yields to the event loop). */
const CHUNK_LINES = 5_000;

export type RowProblem = { line: number; message: string };

/** One of the file's first rows, as read: its time as an instant, its temperature in °C. */
export type PreviewRow = { line: number; time: string; at: number | null; tempC: number | null; rh: number | null; problem: string | null };

/** Per-minute summaries, in columns (one entry per minute, in time order). */
export type MinuteColumns = { minute: number[]; samples: number[]; min: number[]; max: number[]; mean: number[]; rhMean: (number | null)[] };

export type ParsedReadings = {
  /** Data rows read (blank lines not counted). */
  rows: number;
  good: number;
  bad: number;
  /** The first problems, in line order; `bad` counts them all. */
  problems: RowProblem[];
  preview: PreviewRow[];
  minutes: MinuteColumns;
  firstAt: number | null;
  lastAt: number | null;
  /** Times that fell in a repeated hour, and the local dates of those hours. */
  repeatedHour: { rows: number; dates: string[] };
};

export type ParseOutcome = ({ ok: true } & ParsedReadings) | { ok: false; message: string; field?: keyof ReadingImportOptions };

export type ParseProgress = (done: number, total: number) => void | Promise<void>;

const NUMBER_RE = { ".": /^[-+−]?\d+(\.\d+)?$/, ",": /^[-+−]?\d+(,\d+)?$/ } as const;

/** A number as the file writes it, or what is wrong with it. */
export function readNumber(raw: string, decimal: "." | ","): number | string {
  const text = raw.trim();
  if (text === "") return "is empty";
  if (NUMBER_RE[decimal].test(text)) return Number(text.replace("−", "-").replace(",", "."));
  const other = decimal === "." ? "," : ".";
  if (NUMBER_RE[other].test(text)) return `"${text}" has a decimal ${other === "," ? "comma" : "point"}; the import was set to a decimal ${decimal === "," ? "comma" : "point"}`;
  return `"${text}" is not a number`;
}

const round = (n: number, digits: number) => Math.round(n * 10 ** digits) / 10 ** digits;
const localDate = (ms: number, offsetMin: number) => new Date(ms + offsetMin * 60_000).toISOString().slice(0, 10);
const longDate = (isoDate: string) => new Date(`${isoDate}T12:00:00Z`).toLocaleDateString("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });

function columnIndex(header: string[], name: string, label: string): number | string {
  const at = header.flatMap((h, i) => (h === name.trim() ? [i] : []));
  if (at.length === 0) return `The file has no column called "${name}" for the ${label}.`;
  if (at.length > 1) return `The file has ${at.length} columns called "${name}"; rename one so the ${label} column is clear.`;
  return at[0]!;
}

/**
 * Cuts the body into pieces of about `lines` lines, each ending outside any quoted
 * value (an even count of quote marks so far), so each piece parses on its own.
 */
function* pieces(text: string, lines: number): Generator<{ text: string; firstLine: number }> {
  let from = 0;
  let line = 0;
  while (from < text.length) {
    let end = from;
    let n = 0;
    let quotes = 0;
    while (end < text.length) {
      const next = text.indexOf("\n", end);
      const stop = next === -1 ? text.length : next + 1;
      for (let i = end; i < stop; i++) if (text.charCodeAt(i) === 34) quotes++;
      end = stop;
      n++;
      if (n >= lines && quotes % 2 === 0) break;
    }
    yield { text: text.slice(from, end), firstLine: line };
    line += n;
    from = end;
  }
}

type Minute = { samples: number; min: number; max: number; sum: number; rhN: number; rhSum: number };

/**
 * Reads every data row of the file with the person's options. `now` bounds the times
 * (nothing from the future); `onProgress` hears the rows read so far after each piece.
 */
export async function parseReadings(
  file: CsvFile,
  options: ReadingImportOptions,
  { now, onProgress, lineOffset = 1 }: { now: number; onProgress?: ParseProgress; lineOffset?: number },
): Promise<ParseOutcome> {
  const timeAt = columnIndex(file.header, options.timeColumn, "time");
  if (typeof timeAt === "string") return { ok: false, message: timeAt, field: "timeColumn" };
  const tempAt = columnIndex(file.header, options.temperatureColumn, "temperature");
  if (typeof tempAt === "string") return { ok: false, message: tempAt, field: "temperatureColumn" };
  const rhAt = options.humidityColumn ? columnIndex(file.header, options.humidityColumn, "humidity") : null;
  if (typeof rhAt === "string") return { ok: false, message: rhAt, field: "humidityColumn" };
  if (timeAt === tempAt || timeAt === rhAt || tempAt === rhAt) return { ok: false, message: "Choose a different column for each of time, temperature and humidity.", field: "temperatureColumn" };
  const needed = Math.max(timeAt, tempAt, rhAt ?? 0) + 1;

  const zone = zoneReader(options.timeZone);
  const seen = new Map<number, number>();
  const minutes = new Map<number, Minute>();
  const problems: RowProblem[] = [];
  const preview: PreviewRow[] = [];
  const repeatedDates = new Set<string>();
  let rows = 0;
  let bad = 0;
  let repeatedRows = 0;
  let firstAt = Infinity;
  let lastAt = -Infinity;
  const commaClash = options.decimal === "," && file.delimiter === ",";

  const problem = (line: number, message: string) => {
    bad++;
    if (problems.length < READING_IMPORT_LIMITS.problemsShown) problems.push({ line, message });
  };

  function readRow(record: string[], line: number) {
    rows++;
    const show = preview.length < READING_IMPORT_LIMITS.previewRows;
    const row: PreviewRow = { line, time: record[timeAt as number] ?? "", at: null, tempC: null, rh: null, problem: null };
    if (show) preview.push(row);
    const reasons: string[] = [];
    if (record.length < needed) {
      const message = commaClash
        ? `has ${record.length} values where the header names ${file.header.length}: with decimal commas, put each number in quotes or separate the columns with semicolons`
        : `has ${record.length} values where the header names ${file.header.length}`;
      problem(line, message);
      row.problem = message;
      return;
    }
    if (commaClash && record.length > file.header.length) reasons.push(`has more values than the header names: with decimal commas, put each number in quotes or separate the columns with semicolons`);

    // Time.
    const written = record[timeAt as number]!;
    const time = readTime(written, options.dateFormat);
    let at: number | null = null;
    if (time.kind === "bad") reasons.push(`time "${written.trim()}" ${time.reason}`);
    else if (time.kind === "instant") at = time.ms;
    else {
      const found = zone.toInstant(time.wall);
      if (found.kind === "one") at = found.ms;
      else if (found.kind === "gap") {
        const day = localDate(found.atMs, zone.offsetAt(found.atMs - 60_000));
        reasons.push(`time "${written.trim()}" does not exist in ${options.timeZone}: the clocks went forward from ${found.fromLocal} to ${found.toLocal} on ${longDate(day)}`);
      } else {
        // The repeated hour: the first time round, or the second when the first is taken.
        at = seen.has(found.first) && !seen.has(found.second) ? found.second : found.first;
        repeatedRows++;
        repeatedDates.add(localDate(found.first, zone.offsetAt(found.first)));
      }
    }
    if (at !== null && at > now) reasons.push(`time "${written.trim()}" is in the future`);
    if (at !== null) {
      const earlier = seen.get(at);
      if (earlier !== undefined) reasons.push(`the same time as line ${earlier}`);
    }

    // Temperature, in °C.
    let tempC: number | null = null;
    const temp = readNumber(record[tempAt as number]!, options.decimal);
    if (typeof temp === "string") reasons.push(`temperature ${temp}`);
    else {
      tempC = options.unit === "f" ? fToC(temp) : temp;
      if (tempC < TEMPERATURE_RANGE_C.min || tempC > TEMPERATURE_RANGE_C.max) {
        const shown = options.unit === "f" ? `${temp} °F (${round(tempC, 1)} °C)` : `${temp} °C`;
        reasons.push(`temperature ${shown} is outside ${TEMPERATURE_RANGE_C.min} to ${TEMPERATURE_RANGE_C.max} °C`);
      }
    }

    // Humidity, optional: an empty cell is no humidity.
    let rh: number | null = null;
    const rhText = rhAt === null ? "" : (record[rhAt as number] ?? "");
    if (rhText.trim() !== "") {
      const value = readNumber(rhText, options.decimal);
      if (typeof value === "string") reasons.push(`humidity ${value}`);
      else if (value < 0 || value > 100) reasons.push(`humidity ${value} % is outside 0 to 100 %`);
      else rh = value;
    }

    row.at = at;
    row.tempC = tempC;
    row.rh = rh;
    if (reasons.length) {
      const message = reasons.join("; ");
      row.problem = message;
      problem(line, message);
      return;
    }
    seen.set(at!, line);
    firstAt = Math.min(firstAt, at!);
    lastAt = Math.max(lastAt, at!);
    const key = Math.floor(at! / 60_000) * 60_000;
    const m = minutes.get(key);
    if (m) {
      m.samples++;
      m.min = Math.min(m.min, tempC!);
      m.max = Math.max(m.max, tempC!);
      m.sum += tempC!;
      if (rh !== null) {
        m.rhN++;
        m.rhSum += rh;
      }
    } else minutes.set(key, { samples: 1, min: tempC!, max: tempC!, sum: tempC!, rhN: rh === null ? 0 : 1, rhSum: rh ?? 0 });
  }

  const firstDataLine = lineOffset + file.headerLines;
  for (const piece of pieces(file.body, CHUNK_LINES)) {
    let records: { record: string[]; info: { lines: number } }[];
    try {
      records = parse(piece.text, { delimiter: file.delimiter, info: true, relax_column_count: true, skip_empty_lines: true, trim: true }) as unknown as typeof records;
    } catch (error) {
      const at = (error as { lines?: number }).lines;
      const line = at ? firstDataLine + piece.firstLine + at - 1 : undefined;
      return { ok: false, message: `The file cannot be read as CSV${line ? ` at line ${line}` : ""}: check for a stray quote mark (the columns are separated by ${DELIMITER_NAMES[file.delimiter]}).` };
    }
    for (const { record, info } of records) readRow(record, firstDataLine + piece.firstLine + info.lines - 1);
    records = [];
    if (onProgress) await onProgress(rows, Math.max(rows, file.dataLines));
  }

  const keys = [...minutes.keys()].sort((a, b) => a - b);
  const columns: MinuteColumns = { minute: keys, samples: [], min: [], max: [], mean: [], rhMean: [] };
  for (const key of keys) {
    const m = minutes.get(key)!;
    columns.samples.push(m.samples);
    columns.min.push(round(m.min, 2));
    columns.max.push(round(m.max, 2));
    columns.mean.push(round(m.sum / m.samples, 2));
    columns.rhMean.push(m.rhN ? round(m.rhSum / m.rhN, 2) : null);
  }
  minutes.clear();
  return {
    ok: true,
    rows,
    good: rows - bad,
    bad,
    problems,
    preview,
    minutes: columns,
    firstAt: Number.isFinite(firstAt) ? firstAt : null,
    lastAt: Number.isFinite(lastAt) ? lastAt : null,
    repeatedHour: { rows: repeatedRows, dates: [...repeatedDates].sort() },
  };
}

/** The note kept with an import (and shown by the preview) about the repeated hour. */
export function repeatedHourNote(parsed: Pick<ParsedReadings, "repeatedHour">, timeZone: string): string | null {
  const { rows, dates } = parsed.repeatedHour;
  if (rows === 0) return null;
  return `${rows} ${rows === 1 ? "time fell" : "times fell"} in the hour the clocks went back in ${timeZone} (${dates.map(longDate).join(", ")}), which happens twice: each was taken as the first time round, or the second when that time had already come.`;
}
