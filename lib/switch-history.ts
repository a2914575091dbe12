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

/** "2026-10-25T00:30:00.000Z" from the server's UTC text "2026-10-25 00:30:00.000". */
export const isoFromUtcText = (utc: string) => `${utc.slice(0, 10)}T${utc.slice(11)}Z`;

type LocalQuarter = { prefix: string; minuteShift: number; suffix: string };

/**
 * localTimestamp for instants given as the server's UTC text "YYYY-MM-DD HH:MM:SS.mmm"
 * (an export streamed with no Date per row). Per quarter hour of that text, the local
 * "YYYY-MM-DD HH:" and the offset are worked out once; each row then only shifts its
 * minute. A quarter hour with a clock change inside it, or an offset that is not a
 * whole number of quarter hours (old local mean times), is left to luxon.
 */
export function utcTextTimestampFormatter(timeZone: string): (utc: string) => string {
  const quarters = new Map<string, LocalQuarter | null>();
  const offsetAt = (ms: number) => DateTime.fromMillis(ms, { zone: timeZone }).offset;
  // Luxon's offset costs microseconds: an hour whose two ends agree is looked up once for its four quarters.
  let hourMs = NaN;
  let hourOffset: number | null = null;
  const digit = (text: string, i: number) => text.charCodeAt(i) - 48;
  const quarterOf = (utc: string, quarter: number): LocalQuarter | null => {
    const startMs = Date.UTC(+utc.slice(0, 4), +utc.slice(5, 7) - 1, +utc.slice(8, 10), +utc.slice(11, 13), quarter);
    const hour = startMs - quarter * 60_000;
    if (hour !== hourMs) {
      const first = offsetAt(hour);
      hourMs = hour;
      hourOffset = first === offsetAt(hour + 4 * QUARTER_HOUR_MS - 1) ? first : null;
    }
    const offset = hourOffset ?? offsetAt(startMs);
    if ((hourOffset === null && offset !== offsetAt(startMs + QUARTER_HOUR_MS - 1)) || offset % 15 !== 0) return null;
    const local = new Date(startMs + offset * 60_000);
    const abs = Math.abs(offset);
    return {
      prefix: `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())} ${pad(local.getUTCHours())}:`,
      minuteShift: local.getUTCMinutes() - quarter,
      suffix: ` ${offset < 0 ? "-" : "+"}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`,
    };
  };
  // Rows come in time order, so the last quarter hour is usually the one asked for again.
  let lastKey = "";
  let last: LocalQuarter | null = null;
  return (utc) => {
    const minute = digit(utc, 14) * 10 + digit(utc, 15);
    const quarter = minute - (minute % 15);
    const key = utc.slice(0, 14) + quarter;
    if (key !== lastKey) {
      let found = quarters.get(key);
      if (found === undefined) {
        found = quarterOf(utc, quarter);
        if (quarters.size > 10_000) quarters.clear();
        quarters.set(key, found);
      }
      lastKey = key;
      last = found;
    }
    if (last === null) return localTimestamp(new Date(isoFromUtcText(utc)), timeZone);
    const localMinute = minute + last.minuteShift;
    return `${last.prefix}${localMinute < 10 ? "0" : ""}${localMinute}${utc.slice(16, 19)}${last.suffix}`;
  };
}

/** The export's file name: the site, the dates asked for (or "all"), and the day it was made. */
export function exportFileName(slug: string, range: { from?: string; to?: string }, today: string): string {
  const dates = range.from || range.to ? `${range.from ?? "start"}-to-${range.to ?? today}` : `all-to-${today}`;
  return `${slug}-switches-${dates}.csv`;
}
