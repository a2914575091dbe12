// The plain API on Dates, built on the compiled fast path. Each call compiles afresh:
// fine for a page or a handler; the controller keeps compiled schedules instead.
import { HORIZON_MS, activeAt, compileSchedule, nextChangeAt } from "./compile";
import { DAY_MS, instantToLocal, localToInstant, offsetTable, parseLocalDate } from "./local-time";
import type { ActiveWindow, Occurrence, Schedule } from "./types";

function listOf(schedules: Schedule[] | Schedule): Schedule[] {
  return Array.isArray(schedules) ? schedules : [schedules];
}

function toActiveWindow(o: Occurrence | null): ActiveWindow | null {
  return o && { scheduleId: o.scheduleId, window: o.window, opensAt: new Date(o.opensMs), closesAt: new Date(o.closesMs) };
}

/** The window occurrence in force at `at` in `timeZone`, or null (the plug's default applies). */
export function activeWindow(schedules: Schedule[] | Schedule, timeZone: string, at: Date): ActiveWindow | null {
  const ms = at.getTime();
  return toActiveWindow(activeAt(compileSchedule(listOf(schedules), timeZone, ms, 1), ms));
}

/**
 * The first instant after `at` at which activeWindow gives another occurrence or none,
 * or null when that never happens (no windows, or every season is over).
 *
 * Why one 8-day horizon usually suffices: every supported rule opens at least once a
 * week and no window lasts more than a week, so within 8 days something opens or
 * closes unless the season has not started, has ended, or skip days cover every
 * opening. Then nothing is open, and the search resumes at the next local day on which a
 * window may open (in season, not skipped).
 */
export function nextChange(schedules: Schedule[] | Schedule, timeZone: string, at: Date): Date | null {
  const list = listOf(schedules);
  let cursor = at.getTime();
  // Each empty horizon after the first is explained by at least one skip day or ends the season.
  const rounds = 5 + list.reduce((n, s) => n + s.skipDays.length, 0);
  for (let round = 0; round < rounds; round++) {
    const compiled = compileSchedule(list, timeZone, cursor, HORIZON_MS);
    // Nothing was open just before a resumed cursor, so an occurrence open at it starts there.
    if (round > 0 && activeAt(compiled, cursor) !== null) return new Date(cursor);
    const next = nextChangeAt(compiled, cursor);
    if (next !== null) return new Date(next);
    const resume = firstOpeningDay(list, timeZone, compiled.until);
    if (resume === null) return null;
    cursor = Math.max(resume, compiled.until);
  }
  throw new Error("nextChange did not converge");
}

/** The start (instant) of the first local day on or after `instant`'s on which some window may open. */
function firstOpeningDay(list: Schedule[], timeZone: string, instant: number): number | null {
  const table = offsetTable(timeZone, instant - DAY_MS, instant + DAY_MS);
  const today = Math.floor(instantToLocal(table, instant) / DAY_MS) * DAY_MS;
  let first = Infinity;
  for (const s of list) {
    if (s.windows.length === 0) continue;
    const skip = new Set(s.skipDays.map(parseLocalDate));
    let day = Math.max(today, s.validFrom === null ? today : parseLocalDate(s.validFrom));
    while (skip.has(day)) day += DAY_MS;
    if (s.validUntil !== null && day > parseLocalDate(s.validUntil)) continue;
    first = Math.min(first, day);
  }
  if (first === Infinity) return null;
  return localToInstant(offsetTable(timeZone, first - 2 * DAY_MS, first + 2 * DAY_MS), first);
}
