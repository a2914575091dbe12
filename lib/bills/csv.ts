// Bills uploaded as CSV: a header naming the columns (from, to, kwh, amount and
// optionally label, in any order), then one bill per line. Dates are YYYY-MM-DD and
// numbers use a decimal point without thousands separators; a byte-order mark and CRLF
// line ends are accepted. Every row is checked with the bill schema; the result is
// either every bill or every bad row with its line number, never a part.
import { parse } from "csv-parse/sync";
import { z } from "zod";
import { BILL_CSV_LIMITS, billSchema, type Bill } from "@/lib/schemas/bill";

export const BILL_CSV_COLUMNS = ["from", "to", "kwh", "amount", "label"] as const;
const REQUIRED = ["from", "to", "kwh", "amount"] as const;
type Column = (typeof BILL_CSV_COLUMNS)[number];

export type RowProblem = { line: number; message: string };
export type BillCsvResult = { ok: true; bills: (Bill & { line: number })[] } | { ok: false; message: string; rows: RowProblem[] };

const NUMBER_RE = /^\d+(\.\d+)?$/;
const FIELD_NAMES: Record<string, string> = { startsOn: "from", endsOn: "to", billedKwh: "kwh", billedAmount: "amount", label: "label" };

const fail = (message: string, rows: RowProblem[] = []): BillCsvResult => ({ ok: false, message, rows });

function number(value: string, column: string): number | string {
  if (NUMBER_RE.test(value)) return Number(value);
  if (value === "") return `${column} is empty`;
  if (/^\d{1,3}(,\d{3})+(\.\d+)?$/.test(value) || /^\d+,\d+$/.test(value)) {
    return `${column} "${value}": write numbers with a decimal point and no thousands separator, e.g. 1234.56`;
  }
  return `${column} "${value}" is not a number`;
}

export function parseBillCsv(text: string): BillCsvResult {
  if (text.length > BILL_CSV_LIMITS.maxChars) return fail(`The file is too large: at most ${BILL_CSV_LIMITS.maxChars / 1000} kB.`);
  // Text files hold no NUL or other control characters besides tab and line ends.
  if (/[\u0000-\u0008\u000e-\u001f]/.test(text)) return fail("This is not a CSV text file. Save the bills from your spreadsheet as CSV and try again.");
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, { bom: true, info: true, skip_empty_lines: true, relax_column_count: true, trim: true }) as unknown as typeof records;
  } catch (error) {
    const line = (error as { lines?: number }).lines;
    return fail(`The file cannot be read as CSV${line ? ` (line ${line})` : ""}: check for a stray quote mark.`);
  }
  const [head, ...rows] = records;
  if (!head) return fail("The file is empty.");
  const header = head.record.map((h) => h.toLowerCase());
  const unknown = header.filter((h) => !(BILL_CSV_COLUMNS as readonly string[]).includes(h));
  const missing = REQUIRED.filter((c) => !header.includes(c));
  if (unknown.length || missing.length || new Set(header).size !== header.length) {
    return fail(
      `The first line must name the columns: from,to,kwh,amount and optionally label${missing.length ? ` (missing: ${missing.join(", ")})` : ""}${unknown.length ? ` (not known: ${unknown.map((u) => `"${u}"`).join(", ")})` : ""}.`,
    );
  }
  if (rows.length === 0) return fail("The file has a header but no bills.");
  if (rows.length > BILL_CSV_LIMITS.maxRows) return fail(`The file holds ${rows.length} bills; upload at most ${BILL_CSV_LIMITS.maxRows} at a time.`);

  const at = Object.fromEntries(header.map((h, i) => [h, i])) as Partial<Record<Column, number>>;
  const bills: (Bill & { line: number })[] = [];
  const problems: RowProblem[] = [];
  const seen = new Map<string, number>();
  for (const { record, info } of rows) {
    const line = info.lines;
    if (record.length !== header.length) {
      problems.push({ line, message: `has ${record.length} values where the header names ${header.length}` });
      continue;
    }
    const cell = (c: Column) => (at[c] === undefined ? "" : record[at[c]]!);
    const kwh = number(cell("kwh"), "kwh");
    const amount = number(cell("amount"), "amount");
    const numberProblems = [kwh, amount].filter((v): v is string => typeof v === "string");
    // Numbers that did not read stand in as 0 so the rest of the row is still checked.
    const parsed = billSchema.safeParse({
      startsOn: cell("from"),
      endsOn: cell("to"),
      label: cell("label") || null,
      billedKwh: typeof kwh === "number" ? kwh : 0,
      billedAmount: typeof amount === "number" ? amount : 0,
    });
    if (!parsed.success || numberProblems.length) {
      problems.push({ line, message: [...(parsed.success ? [] : [describeIssues(parsed.error)]), ...numberProblems].join("; ") });
      continue;
    }
    const key = `${parsed.data.startsOn}|${parsed.data.endsOn}`;
    const earlier = seen.get(key);
    if (earlier !== undefined) {
      problems.push({ line, message: `the same dates as line ${earlier}` });
      continue;
    }
    seen.set(key, line);
    bills.push({ ...parsed.data, line });
  }
  if (problems.length) {
    return fail(`${problems.length} ${problems.length === 1 ? "line needs" : "lines need"} fixing; nothing was saved.`, problems);
  }
  return { ok: true, bills };
}

/** The first problem of each column, named as the file names it rather than as the form does. */
function describeIssues(error: z.ZodError): string {
  const byColumn = new Map<string, string>();
  for (const issue of error.issues) {
    const column = FIELD_NAMES[String(issue.path[0])] ?? "row";
    if (!byColumn.has(column)) byColumn.set(column, issue.message.replace(/^(From|To|kWh|Amount|Label) /, ""));
  }
  return [...byColumn].map(([column, message]) => `${column}: ${message}`).join("; ");
}
