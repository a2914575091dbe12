// The switch history's CSV: its header and one record per switch. Text people typed
// (names, reasons) goes through spreadsheetSafe.
import { SWITCH_CAUSE_LABELS, type SwitchCause } from "./domain";
import { SWITCH_STATUS_LABELS, localTimestamp, spreadsheetSafe, type SwitchStatus } from "./switch-history";

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

export function switchCsvRecord(row: CsvSwitch, timeZone: string): string[] {
  return [
    localTimestamp(row.at, timeZone),
    row.at.toISOString(),
    spreadsheetSafe(row.houseName),
    spreadsheetSafe(row.plugName),
    onOff(row.fromOn),
    onOff(row.toOn),
    SWITCH_CAUSE_LABELS[row.cause],
    SWITCH_STATUS_LABELS[row.status],
    row.readingTempC === null ? "" : row.readingTempC.toFixed(2),
    row.readingAt ? row.readingAt.toISOString() : "",
    spreadsheetSafe(row.userName),
    spreadsheetSafe(row.reason),
    row.latencyMs === null ? "" : String(row.latencyMs),
    spreadsheetSafe(row.commandId),
  ];
}
