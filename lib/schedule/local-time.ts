// Wall-clock times and the instants they name in a site's IANA time zone.
//
// A wall-clock ("floating") time is the local date and time written as if it were UTC,
// in epoch ms: 2026-03-29 01:30 local is Date.UTC(2026, 2, 29, 1, 30). Arithmetic on it
// is plain calendar arithmetic, whatever the process's TZ, because only UTC fields are
// ever read or written.
//
// Offsets come from luxon's IANAZone (Intl, i.e. the IANA database in ICU). We do not
// turn wall-clock times into instants with DateTime.fromObject: inside a spring-forward
// gap it moves the time forward by the gap's length (01:30 → 02:30), and for a time that
// exists twice it picks the later instant; Cloche's rules are "first instant after the
// gap" and "the earlier instant" (see lib/schedule/index.ts).
import { IANAZone } from "luxon";

export const MINUTE_MS = 60_000;
export const HOUR_MS = 60 * MINUTE_MS;
export const DAY_MS = 24 * HOUR_MS;

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const TIME_RE = /^([01]\d|2[0-3]):([0-5]\d)(?::([0-5]\d))?$/;
const DATE_TIME_RE = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}(?::\d{2})?)$/;

/** "YYYY-MM-DD" → wall-clock ms of that day's 00:00. Throws RangeError on a date that does not exist. */
export function parseLocalDate(value: string): number {
  const m = DATE_RE.exec(value);
  if (m) {
    const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
    const ms = Date.UTC(y, mo - 1, d);
    const check = new Date(ms);
    if (check.getUTCFullYear() === y && check.getUTCMonth() === mo - 1 && check.getUTCDate() === d) return ms;
  }
  throw new RangeError(`"${value}" is not a date (YYYY-MM-DD)`);
}

/** "HH:MM" or "HH:MM:SS" (00:00 to 23:59:59) → ms since local midnight. */
export function parseTimeOfDay(value: string): number {
  const m = TIME_RE.exec(value);
  if (!m) throw new RangeError(`"${value}" is not a time of day (HH:MM:SS)`);
  return (Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3] ?? 0)) * 1000;
}

/** "YYYY-MM-DDTHH:MM[:SS]" → wall-clock ms. */
export function parseLocalDateTime(value: string): number {
  const m = DATE_TIME_RE.exec(value);
  if (!m) throw new RangeError(`"${value}" is not a local date-time (YYYY-MM-DDTHH:MM:SS)`);
  return parseLocalDate(m[1]!) + parseTimeOfDay(m[2]!);
}

/** Wall-clock ms → "YYYY-MM-DDTHH:MM:SS". */
export function formatLocalDateTime(local: number): string {
  return new Date(local).toISOString().slice(0, 19);
}

/** Wall-clock ms → the local date "YYYY-MM-DD". */
export function formatLocalDate(local: number): string {
  return new Date(local).toISOString().slice(0, 10);
}

/**
 * A zone's UTC offsets over a stretch of time: offsets[i] (minutes east of UTC) is in
 * force from starts[i] (an instant; starts[0] is -Infinity) until starts[i + 1]. Only
 * accurate between `from` and `until`: outside, the first and last offsets are assumed.
 */
export type OffsetTable = {
  readonly timeZone: string;
  readonly from: number;
  readonly until: number;
  readonly starts: readonly number[];
  readonly offsets: readonly number[];
};

/** Offsets are sampled this often: assumes a zone never changes its offset twice within 6 hours (true of current IANA rules). */
const SAMPLE_MS = 6 * HOUR_MS;

// Building a table costs about 100 Intl calls. The controller compiles thousands of
// plugs per site zone at once, so tables are memoised per zone and whole UTC days.
const tables = new Map<string, OffsetTable>();
const MAX_TABLES = 256;

export function isTimeZone(timeZone: string): boolean {
  return IANAZone.isValidZone(timeZone);
}

/** The offsets of `timeZone` from `from` to `until` (instants), widened to whole UTC days. */
export function offsetTable(timeZone: string, from: number, until: number): OffsetTable {
  const start = Math.floor(from / DAY_MS) * DAY_MS;
  const end = Math.ceil(until / DAY_MS) * DAY_MS;
  const key = `${timeZone}|${start}|${end}`;
  const cached = tables.get(key);
  if (cached) return cached;

  const zone = IANAZone.create(timeZone);
  if (!zone.isValid) throw new RangeError(`"${timeZone}" is not an IANA time zone`);
  const starts = [-Infinity];
  const offsets = [zone.offset(start)];
  let before = start;
  let beforeOffset = offsets[0]!;
  for (let t = start + SAMPLE_MS; before < end; t += SAMPLE_MS) {
    const at = Math.min(t, end);
    const offset = zone.offset(at);
    if (offset !== beforeOffset) {
      starts.push(findChange(zone, before, at, beforeOffset));
      offsets.push(offset);
    }
    before = at;
    beforeOffset = offset;
  }

  const table = { timeZone, from: start, until: end, starts, offsets };
  if (tables.size >= MAX_TABLES) tables.delete(tables.keys().next().value!);
  tables.set(key, table);
  return table;
}

/** The first instant after `lo` whose offset is not `loOffset`, to the second (IANA changes fall on whole seconds). */
function findChange(zone: IANAZone, lo: number, hi: number, loOffset: number): number {
  let loS = Math.floor(lo / 1000);
  let hiS = Math.ceil(hi / 1000);
  while (hiS - loS > 1) {
    const mid = Math.floor((loS + hiS) / 2);
    if (zone.offset(mid * 1000) === loOffset) loS = mid;
    else hiS = mid;
  }
  return hiS * 1000;
}

export function offsetAt(table: OffsetTable, instant: number): number {
  let i = table.starts.length - 1;
  while (i > 0 && instant < table.starts[i]!) i--;
  return table.offsets[i]!;
}

/** Instant → wall-clock ms in the table's zone. */
export function instantToLocal(table: OffsetTable, instant: number): number {
  return instant + offsetAt(table, instant) * MINUTE_MS;
}

/**
 * Wall-clock ms → instant. A time that exists twice (clocks went back) gives the earlier
 * instant; a time that does not exist (clocks went forward) gives the instant the clocks
 * jumped, i.e. the first instant after the gap.
 */
export function localToInstant(table: OffsetTable, local: number): number {
  const { starts, offsets } = table;
  let earliest = NaN;
  for (let i = 0; i < offsets.length; i++) {
    const t = local - offsets[i]! * MINUTE_MS;
    const inForce = t >= starts[i]! && (i + 1 === starts.length || t < starts[i + 1]!);
    if (inForce && (Number.isNaN(earliest) || t < earliest)) earliest = t;
  }
  if (!Number.isNaN(earliest)) return earliest;
  for (let i = 1; i < offsets.length; i++) {
    const gapStart = starts[i]! + offsets[i - 1]! * MINUTE_MS;
    const gapEnd = starts[i]! + offsets[i]! * MINUTE_MS;
    if (local >= gapStart && local < gapEnd) return starts[i]!;
  }
  throw new Error(`No instant for ${formatLocalDateTime(local)} in ${table.timeZone}`);
}

/** "YYYY-MM-DDTHH:MM[:SS]" in `timeZone` → the instant, by the rules of localToInstant. */
export function toInstant(local: string, timeZone: string): Date {
  const wall = parseLocalDateTime(local);
  return new Date(localToInstant(offsetTable(timeZone, wall - 2 * DAY_MS, wall + 2 * DAY_MS), wall));
}

/** The local date-time "YYYY-MM-DDTHH:MM:SS" of an instant in `timeZone`. */
export function toLocal(at: Date, timeZone: string): string {
  const t = at.getTime();
  return formatLocalDateTime(instantToLocal(offsetTable(timeZone, t - DAY_MS, t + DAY_MS), t));
}
