// Words and times of one switch on the history page (the CSV has its own columns).
import { SWITCH_CAUSE_LABELS, type SwitchCause } from "@/lib/domain";
import { SWITCH_STATUS_LABELS, type SwitchStatus } from "@/lib/switch-history";

/** A switch as the API sends it (times as ISO text). */
export type SwitchJson = {
  id: number;
  at: string;
  plugId: string;
  plugName: string;
  plugRetired: boolean;
  houseName: string;
  fromOn: boolean | null;
  toOn: boolean;
  cause: SwitchCause;
  status: SwitchStatus;
  readingTempC: number | null;
  readingAt: string | null;
  userName: string | null;
  reason: string | null;
  latencyMs: number | null;
};

export const onOff = (on: boolean | null) => (on === null ? "unknown" : on ? "On" : "Off");

export const causeLabel = (cause: SwitchCause) => SWITCH_CAUSE_LABELS[cause];

/** What a person should read about the switch's outcome; null for an ordinary carried-out switch. */
export function statusNote(row: Pick<SwitchJson, "status" | "latencyMs">): string | null {
  if (row.status === "carried_out") return null;
  if (row.status === "withdrawn") return `${SWITCH_STATUS_LABELS.withdrawn}: a newer decision replaced it before the plug confirmed`;
  if (row.status === "observed") return `${SWITCH_STATUS_LABELS.observed}: the plug changed and Cloche saw it`;
  return SWITCH_STATUS_LABELS.unconfirmed;
}

/** "Sat 25 Oct 2026" and "01:30:05 BST" in the site's zone. */
export function localParts(at: string, timeZone: string): { day: string; time: string } {
  const date = new Date(at);
  return {
    day: new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "short", day: "numeric", month: "short", year: "numeric" }).format(date),
    time: new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23", timeZoneName: "short" }).format(date),
  };
}

/** "read 4 min before": how old the reading behind a decision was, when it is a minute or more. */
export function readingAge(at: string, readingAt: string | null): string | null {
  if (!readingAt) return null;
  const seconds = Math.max(0, Math.round((new Date(at).getTime() - new Date(readingAt).getTime()) / 1000));
  if (seconds < 60) return null;
  if (seconds < 90 * 60) return `read ${Math.round(seconds / 60)} min before`;
  return `read ${(seconds / 3600).toFixed(1)} h before`;
}

export function latencyText(latencyMs: number | null): string | null {
  if (latencyMs === null) return null;
  return latencyMs < 1000 ? `confirmed in ${latencyMs} ms` : `confirmed in ${(latencyMs / 1000).toFixed(1)} s`;
}
