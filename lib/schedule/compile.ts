// The fast path: a plug's schedules turned, for a horizon, into a sorted list of
// non-overlapping segments in epoch ms, each naming the window occurrence in force.
// Looking up an instant is a binary search over a Float64Array, with no allocation and
// no luxon; the zone and the rules are only consulted when compiling.
import { DAY_MS, MINUTE_MS, instantToLocal, localToInstant, offsetTable, parseLocalDate, parseTimeOfDay } from "./local-time";
import { type Check, expandWallClock, parseRule, validateRecurrence } from "./recurrence";
import type { Occurrence, Schedule, ScheduleWindow } from "./types";

/** A window lasts at most a week. This is what makes an 8-day horizon enough (see nextChange). */
export const MAX_DURATION_MIN = 7 * 24 * 60;
/** One week of openings plus a day for windows that span midnight and DST changes. */
export const HORIZON_MS = 8 * DAY_MS;

export type CompiledSchedule = {
  readonly timeZone: string;
  /** Queries are valid for from <= ms < until (epoch ms). */
  readonly from: number;
  readonly until: number;
  /** Segment i runs from starts[i] (inclusive) to ends[i] (exclusive); segments are sorted and do not overlap. */
  readonly starts: Float64Array;
  readonly ends: Float64Array;
  /** The occurrence in force during segment i. */
  readonly occurrences: readonly Occurrence[];
};

/** Whether a window's own fields are usable: recurrence, start time, duration. */
export function validateWindow(window: Pick<ScheduleWindow, "recurrence" | "startsAt" | "durationMin">): Check {
  const rule = validateRecurrence(window.recurrence);
  if (!rule.ok) return rule;
  try {
    parseTimeOfDay(window.startsAt);
  } catch (error) {
    return { ok: false, error: (error as Error).message };
  }
  const d = window.durationMin;
  if (!Number.isInteger(d) || d < 1 || d > MAX_DURATION_MIN) {
    return { ok: false, error: `The duration must be a whole number of minutes from 1 to ${MAX_DURATION_MIN}` };
  }
  return { ok: true };
}

type Candidate = { readonly occurrence: Occurrence; readonly rank: number };

/**
 * Compile `schedules` (one plug's) for queries from `from` to `from + horizonMs`.
 * Throws on a window that validateWindow refuses, a malformed date or an unknown zone:
 * stored data is checked on the way in, so this is a bug to surface, not to guess around.
 */
export function compileSchedule(
  schedules: Schedule[] | Schedule,
  timeZone: string,
  from: number,
  horizonMs: number = HORIZON_MS,
): CompiledSchedule {
  const list = Array.isArray(schedules) ? schedules : [schedules];
  const until = from + horizonMs;
  for (const s of list) {
    for (const w of s.windows) {
      const check = validateWindow(w);
      if (!check.ok) throw new RangeError(`Window ${w.id} of schedule ${s.id}: ${check.error}`);
    }
  }

  // Occurrences that opened up to a week before `from` may still be open. Every plug
  // compiled on a given day expands the same days, so that they share memoised expansions.
  const lookBack = MAX_DURATION_MIN * MINUTE_MS;
  // The table reaches a week past `until` too: an occurrence opening near the end closes
  // up to a week later, and its closing time needs that day's offset (a DST change).
  const table = offsetTable(timeZone, from - lookBack - 2 * DAY_MS, until + lookBack + 2 * DAY_MS);
  const firstDay = startOfDay(instantToLocal(table, from - lookBack)) - DAY_MS;
  const lastDay = startOfDay(instantToLocal(table, until)) + DAY_MS;

  const candidates: Candidate[] = [];
  let rank = 0;
  for (const s of list) {
    const seasonFrom = s.validFrom === null ? -Infinity : parseLocalDate(s.validFrom);
    const seasonUntil = s.validUntil === null ? Infinity : parseLocalDate(s.validUntil);
    const skip = new Set(s.skipDays.map(parseLocalDate));
    for (const w of s.windows) {
      rank++;
      const timeOfDay = parseTimeOfDay(w.startsAt);
      for (const local of openings(w.recurrence, timeOfDay, firstDay, lastDay)) {
        const day = startOfDay(local);
        if (day < seasonFrom || day > seasonUntil || skip.has(day)) continue;
        const opensMs = localToInstant(table, local);
        const closesMs = localToInstant(table, local + w.durationMin * MINUTE_MS);
        // Empty when both ends fall in the same spring-forward gap: that hour never happens.
        if (closesMs <= opensMs || closesMs <= from || opensMs > until) continue;
        candidates.push({ occurrence: { scheduleId: s.id, window: w, opensMs, closesMs }, rank });
      }
    }
  }
  return { timeZone, from, until, ...segmentsOf(candidates, from) };
}

// Expanding a rule with rrule costs about 60 µs; a controller compiles thousands of
// plugs that share a few rules, so expansions are memoised (the arrays are never changed).
const expansions = new Map<string, readonly number[]>();
const MAX_EXPANSIONS = 1024;

/** Wall-clock openings of `rule` at `timeOfDay` on local days firstDay to lastDay. */
function openings(rule: string, timeOfDay: number, firstDay: number, lastDay: number): readonly number[] {
  const key = `${rule}|${timeOfDay}|${firstDay}|${lastDay}`;
  let opens = expansions.get(key);
  if (!opens) {
    opens = expandWallClock(parseRule(rule), firstDay + timeOfDay, { from: firstDay, until: lastDay + timeOfDay });
    if (expansions.size >= MAX_EXPANSIONS) expansions.delete(expansions.keys().next().value!);
    expansions.set(key, opens);
  }
  return opens;
}

function startOfDay(local: number): number {
  return Math.floor(local / DAY_MS) * DAY_MS;
}

/** Overlaps: the occurrence that opened latest wins; then the one that closes first; then the one listed first. */
function beats(a: Candidate, b: Candidate): boolean {
  const x = a.occurrence;
  const y = b.occurrence;
  if (x.opensMs !== y.opensMs) return x.opensMs > y.opensMs;
  if (x.closesMs !== y.closesMs) return x.closesMs < y.closesMs;
  return a.rank < b.rank;
}

function segmentsOf(candidates: Candidate[], from: number) {
  const bounds = [...new Set(candidates.flatMap((c) => [c.occurrence.opensMs, c.occurrence.closesMs]))].sort(
    (a, b) => a - b,
  );
  const starts: number[] = [];
  const ends: number[] = [];
  const occurrences: Occurrence[] = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const start = bounds[k]!;
    const end = bounds[k + 1]!;
    if (end <= from) continue;
    let best: Candidate | undefined;
    for (const c of candidates) {
      const { opensMs, closesMs } = c.occurrence;
      if (opensMs <= start && start < closesMs && (best === undefined || beats(c, best))) best = c;
    }
    if (best === undefined) continue;
    const last = occurrences.length - 1;
    if (last >= 0 && occurrences[last] === best.occurrence && ends[last] === start) {
      ends[last] = end;
    } else {
      occurrences.push(best.occurrence);
      starts.push(start);
      ends.push(end);
    }
  }
  return { starts: Float64Array.from(starts), ends: Float64Array.from(ends), occurrences };
}

/** Whether `compiled` answers for `ms`; when not, compile again from `ms`. */
export function covers(compiled: CompiledSchedule, ms: number): boolean {
  return ms >= compiled.from && ms < compiled.until;
}

function segmentAtOrBefore(starts: Float64Array, ms: number): number {
  let lo = 0;
  let hi = starts.length - 1;
  let found = -1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (starts[mid]! <= ms) {
      found = mid;
      lo = mid + 1;
    } else {
      hi = mid - 1;
    }
  }
  return found;
}

function assertCovers(compiled: CompiledSchedule, ms: number) {
  if (!covers(compiled, ms)) throw new RangeError("The instant is outside the compiled horizon; compile again");
}

/** The occurrence in force at `ms` (open at its opening instant, closed at its closing instant), or null. */
export function activeAt(compiled: CompiledSchedule, ms: number): Occurrence | null {
  assertCovers(compiled, ms);
  const i = segmentAtOrBefore(compiled.starts, ms);
  return i >= 0 && ms < compiled.ends[i]! ? compiled.occurrences[i]! : null;
}

/**
 * The first instant after `ms` at which activeAt gives something else, if it is no later
 * than `compiled.until`; null means "no change up to the end of the horizon".
 */
export function nextChangeAt(compiled: CompiledSchedule, ms: number): number | null {
  assertCovers(compiled, ms);
  const { starts, ends } = compiled;
  const i = segmentAtOrBefore(starts, ms);
  const next = i >= 0 && ms < ends[i]! ? ends[i]! : i + 1 < starts.length ? starts[i + 1]! : Infinity;
  return next <= compiled.until ? next : null;
}
