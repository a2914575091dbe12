// The form's first guesses from the start of a file: which columns hold the time,
// temperature and humidity, how times are written, the unit and the decimal separator.
// Only guesses: the person sees them in the preview and can change each.
import { parse } from "csv-parse/sync";
import type { ReadingImportOptions } from "@/lib/schemas/reading-import";
import type { CsvFile } from "./file";
import { DATE_FORMATS, readTime, type DateFormat } from "./formats";

export type ImportGuess = Pick<ReadingImportOptions, "timeColumn" | "temperatureColumn" | "humidityColumn" | "dateFormat" | "unit" | "decimal">;

const TIME_RE = /time|date|zeit|datum|heure|fecha|hora|timestamp|when/i;
const TEMP_RE = /temp|°\s*[cf]|℃|℉|celsius|fahrenheit/i;
const RH_RE = /humid|feucht|rh\b|%|hygro/i;
const FAHRENHEIT_RE = /°\s*f|℉|fahrenheit|\(f\)|_f\b|\bdeg\s*f\b/i;

/** The first few data rows of a file (those the start of the file holds whole). */
export function sampleRows(file: CsvFile, count = 30): string[][] {
  try {
    return (parse(file.body, { delimiter: file.delimiter, to_line: count, relax_column_count: true, skip_empty_lines: true, trim: true }) as string[][]).filter((r) => r.length > 1);
  } catch {
    return [];
  }
}

export function guessOptions(file: CsvFile, rows: string[][]): ImportGuess {
  const { header } = file;
  const pick = (re: RegExp, taken: string[]) => header.find((h) => h !== "" && re.test(h) && !taken.includes(h)) ?? "";
  const timeColumn = pick(TIME_RE, []) || header[0] || "";
  const temperatureColumn = pick(TEMP_RE, [timeColumn]) || header.find((h) => h !== "" && h !== timeColumn) || "";
  const humidityColumn = pick(RH_RE, [timeColumn, temperatureColumn]);

  const column = (name: string) => {
    const at = header.indexOf(name);
    return at === -1 ? [] : rows.map((r) => r[at] ?? "").filter((v) => v.trim() !== "");
  };
  const times = column(timeColumn);
  const values = [...column(temperatureColumn), ...column(humidityColumn)];

  // The first format that reads every sampled time (day/month before month/day: a file
  // whose days stay at 12 or below reads both ways, and the preview shows the dates).
  const dateFormat: DateFormat = DATE_FORMATS.find((f) => times.length > 0 && times.every((t) => readTime(t, f).kind !== "bad")) ?? "iso";
  const decimal = values.some((v) => /^[-+−]?\d+,\d+$/.test(v)) && !values.some((v) => /^[-+−]?\d+\.\d+$/.test(v)) ? "," : ".";
  const unit = FAHRENHEIT_RE.test(temperatureColumn) ? "f" : "c";
  return { timeColumn, temperatureColumn, humidityColumn, dateFormat, unit, decimal };
}
