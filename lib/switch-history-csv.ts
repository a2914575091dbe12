// The switch history's CSV: its header and one record per switch. Text people typed
// (names, reasons) goes through csvText (lib/csv.ts).
import { SWITCH_CAUSE_LABELS, type SwitchCause } from "./domain";
import { csvText } from "./csv";
import { SWITCH_STATUS_LABELS, localTimestampFormatter, type SwitchStatus } from "./switch-history";

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
