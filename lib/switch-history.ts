// How the switch history is read: what each logged switch was (carried out, withdrawn,
// only observed), the opaque keyset cursor of its newest-first pages, and text made
// safe for spreadsheets.
import { DateTime } from "luxon";
import type { SwitchCause } from "./domain";

/** Causes the controller only saw happen: it did not command them. */
export const OBSERVED_CAUSES: readonly SwitchCause[] = ["plug_fallback", "resync"];

/**
 * What became of a logged switch. `withdrawn`: replaced by a newer decision before the
 * plug confirmed it, so it never happened. `observed`: the plug changed without a
 * command. `unconfirmed`: commanded, not (yet) echoed by the plug.
 */
export const SWITCH_STATUSES = ["carried_out", "withdrawn", "observed", "unconfirmed"] as const;
export type SwitchStatus = (typeof SWITCH_STATUSES)[number];

export const SWITCH_STATUS_LABELS: Record<SwitchStatus, string> = {
  carried_out: "Carried out",
  withdrawn: "Withdrawn, never happened",
  observed: "Observed, not commanded",
  unconfirmed: "Not confirmed by the plug",
};

export function switchStatus(row: { cause: SwitchCause; withdrawnAt: Date | string | null; ackAt: Date | string | null }): SwitchStatus {
  if (row.withdrawnAt) return "withdrawn";
  if (OBSERVED_CAUSES.includes(row.cause)) return "observed";
  return row.ackAt ? "carried_out" : "unconfirmed";
}

/** The keyset of the newest-first list: (at, id) of the last row shown. */
export type SwitchCursor = { at: Date; id: number };

const CURSOR_PREFIX = "s1";

/** Opaque to clients: they hand back what they were given (base 36, so it needs no Buffer in the browser). */
export function encodeSwitchCursor({ at, id }: SwitchCursor): string {
  return `${CURSOR_PREFIX}${at.getTime().toString(36)}-${id.toString(36)}`;
}

export function decodeSwitchCursor(cursor: string): SwitchCursor | null {
  const match = /^s1([0-9a-z]{1,11})-([0-9a-z]{1,11})$/.exec(cursor);
  if (!match) return null;
  const ms = parseInt(match[1]!, 36);
  const id = parseInt(match[2]!, 36);
  if (!Number.isSafeInteger(ms) || !Number.isSafeInteger(id) || id < 1) return null;
  const at = new Date(ms);
  return Number.isNaN(at.getTime()) ? null : { at, id };
}

/** "2026-10-25 01:30:00 +01:00": a local time with its UTC offset, so the hour a clock change repeats reads apart (zone abbreviations depend on the locale). */
export function localTimestamp(at: Date, timeZone: string): string {
  return DateTime.fromJSDate(at, { zone: timeZone }).toFormat("yyyy-MM-dd HH:mm:ss ZZ");
}

const QUARTER_HOUR_MS = 15 * 60_000;
const pad = (n: number, width = 2) => String(n).padStart(width, "0");

/**
 * localTimestamp for many rows (an export of millions): the zone's offset is looked up
 * once per quarter hour and the text built by hand, about twenty times faster than
 * luxon per row. A quarter hour whose two ends have different offsets (a clock change
 * inside it) is left to luxon, so every row reads as localTimestamp says.
 */
export function localTimestampFormatter(timeZone: string): (at: Date) => string {
  const offsets = new Map<number, number | null>();
  const offsetAt = (ms: number) => DateTime.fromMillis(ms, { zone: timeZone }).offset;
  return (at) => {
    const ms = at.getTime();
    const bucket = Math.floor(ms / QUARTER_HOUR_MS);
    let offset = offsets.get(bucket);
    if (offset === undefined) {
      const start = offsetAt(bucket * QUARTER_HOUR_MS);
      offset = start === offsetAt((bucket + 1) * QUARTER_HOUR_MS - 1) ? start : null;
      if (offsets.size > 10_000) offsets.clear();
      offsets.set(bucket, offset);
    }
    if (offset === null) return localTimestamp(at, timeZone);
    const local = new Date(ms + offset * 60_000);
    const sign = offset < 0 ? "-" : "+";
    const abs = Math.abs(offset);
    return (
      `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())} ` +
      `${pad(local.getUTCHours())}:${pad(local.getUTCMinutes())}:${pad(local.getUTCSeconds())} ${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`
    );
  };
}

/** The export's file name: the site, the dates asked for (or "all"), and the day it was made. */
export function exportFileName(slug: string, range: { from?: string; to?: string }, today: string): string {
  const dates = range.from || range.to ? `${range.from ?? "start"}-to-${range.to ?? today}` : `all-to-${today}`;
  return `${slug}-switches-${dates}.csv`;
}
