// The switch history's CSV: its header and one record per switch. Text people typed
// (names, reasons) goes through csvText (lib/csv.ts).
import { SWITCH_CAUSE_LABELS, type SwitchCause } from "./domain";
import { csvCell, csvLine, csvText } from "./csv";
import { SWITCH_STATUS_LABELS, isoFromUtcText, localTimestampFormatter, utcTextTimestampFormatter, type SwitchStatus } from "./switch-history";

export type CsvSwitch = {
  at: Date;
  houseName: string;
  plugName: string;
  fromOn: boolean | null;
  toOn: boolean;
  cause: SwitchCause;
  status: SwitchStatus;
  readingTempC: number | null;
  readingAt: Date | null;
  userName: string | null;
  reason: string | null;
  latencyMs: number | null;
  commandId: string;
};

/** A switch as an export streams it: instants as the server's UTC text "YYYY-MM-DD HH:MM:SS.mmm", the reading as the driver gives a DECIMAL. */
export type CsvSwitchText = Omit<CsvSwitch, "at" | "readingAt" | "readingTempC"> & { at: string; readingAt: string | null; readingTempC: string | number | null };

export function switchCsvHeader(timeZone: string): string[] {
  return [
    `Local time (${timeZone})`,
    "UTC time (ISO 8601)",
    "House",
    "Plug",
    "From",
    "To",
    "Cause",
    "Status",
    "Reading (°C)",
    "Reading time (UTC, ISO 8601)",
    "Person",
    "Reason",
    "Latency (ms)",
    "Command id",
  ];
}

const onOff = (on: boolean | null) => (on === null ? "" : on ? "on" : "off");

/** The function that makes one record per switch, for rows in the site's zone. */
export function switchCsvRecords(timeZone: string): (row: CsvSwitch) => string[] {
  const local = localTimestampFormatter(timeZone);
  return (row) => [
    local(row.at),
    row.at.toISOString(),
    csvText(row.houseName),
    csvText(row.plugName),
    onOff(row.fromOn),
    onOff(row.toOn),
    SWITCH_CAUSE_LABELS[row.cause],
    SWITCH_STATUS_LABELS[row.status],
    row.readingTempC === null ? "" : row.readingTempC.toFixed(2),
    row.readingAt ? row.readingAt.toISOString() : "",
    csvText(row.userName),
    csvText(row.reason),
    row.latencyMs === null ? "" : String(row.latencyMs),
    csvText(row.commandId),
  ];
}

/** The header line, with a UTF-8 byte-order mark so spreadsheets read °C and accented names right. */
export const switchCsvHead = (timeZone: string) => "\uFEFF" + csvLine(switchCsvHeader(timeZone));

const mapCells = <K extends string>(labels: Record<K, string>) => Object.fromEntries(Object.entries(labels).map(([k, v]) => [k, csvCell(v as string)])) as Record<K, string>;
const CAUSE_CELLS = mapCells(SWITCH_CAUSE_LABELS);
const STATUS_CELLS = mapCells(SWITCH_STATUS_LABELS);

/**
 * The function that writes one CSV line per switch (what switchCsvRecords makes, as
 * csv-stringify would write it), built by hand for exports of millions of rows: no
 * array per record, and only typed text checked for quoting.
 */
export function switchCsvLines(timeZone: string): (row: CsvSwitchText) => string {
  const local = utcTextTimestampFormatter(timeZone);
  const text = (value: string | null) => csvCell(csvText(value));
  return (row) =>
    `${local(row.at)},${isoFromUtcText(row.at)},${text(row.houseName)},${text(row.plugName)},${onOff(row.fromOn)},${onOff(row.toOn)},` +
    `${CAUSE_CELLS[row.cause]},${STATUS_CELLS[row.status]},${row.readingTempC === null ? "" : Number(row.readingTempC).toFixed(2)},` +
    `${row.readingAt === null ? "" : isoFromUtcText(row.readingAt)},${text(row.userName)},${text(row.reason)},` +
    `${row.latencyMs === null ? "" : row.latencyMs},${text(row.commandId)}\n`;
}
