/**
 * Schedule resolution: which time window of a plug is in force at an instant, and when
 * that next changes. Pure and synchronous; time and the site's IANA zone are arguments,
 * and the process's TZ never matters.
 *
 * The rules (each has a test in tests/unit/schedule*.test.ts):
 *
 * - **Recurrence.** `recurrence` is an RFC 5545 RRULE value without DTSTART, limited to
 *   what validateRecurrence accepts (FREQ=DAILY/WEEKLY, BYDAY weekdays, INTERVAL=1,
 *   WKST; no COUNT/UNTIL). Rules are expanded on wall-clock fields: rrule sees the local
 *   date-time written as if it were UTC, and each local start is then placed in the
 *   site's zone.
 * - **Wall-clock times across DST.** A window keeps its local times (RFC 5545: 09:00
 *   stays 09:00 when the clocks change). It closes at the local time start +
 *   `durationMin` on the wall clock, so lights 06:00 → 20:00 close at 20:00 on a 23- or
 *   25-hour day; a window that spans a change lasts an hour less or more in elapsed time.
 * - **Start time that does not exist** (clocks go forward): the window opens at the first
 *   instant after the gap — 01:30 in Europe/London on 2026-03-29 opens at 02:00 BST
 *   (01:00 UTC). A closing time in a gap closes at the same instant; a window lying wholly
 *   inside the gap does not happen that day.
 * - **Time that exists twice** (clocks go back): the first occurrence, the earlier
 *   instant, for opening and closing times alike.
 * - **Overlaps** between windows (of one or several schedules of the plug): the
 *   occurrence that opened latest is in force; when it closes, the one it interrupted
 *   resumes until its own close. Same opening instant: the one that closes first, then
 *   the one listed first. A window is in force from its opening instant (inclusive) to
 *   its closing instant (exclusive), so windows that touch leave no gap.
 * - **Season.** Windows open only on local dates from `validFrom` to `validUntil`
 *   (inclusive, null = open-ended); an occurrence that opened on `validUntil` runs to its
 *   close. **Skip days**: no window opens on that local date; one that opened the day
 *   before runs to its close.
 * - **Midnight.** A window belongs to the local date it opens on; 22:00 + 8 h opened
 *   yesterday is in force at 01:00 today.
 * - **Changes.** nextChange reports every change of occurrence, including one occurrence
 *   of a window followed directly by the next (a daily 24 h window changes at its start
 *   time each day).
 * - **Horizon.** compileSchedule covers 8 days (a week of openings plus a day), enough
 *   because no window lasts more than 7 days (MAX_DURATION_MIN). Past the horizon,
 *   activeAt/nextChangeAt throw: check covers() and compile again. nextChange searches
 *   beyond it when a season has not started or skip days cover a whole week.
 *
 * For the controller: compileSchedule once per plug (and again when its schedules change
 * or the horizon runs out), then activeAt/nextChangeAt per tick — a binary search, no
 * allocation, no luxon. Compiling memoises zone offset tables and rule expansions per
 * zone/rule and day; the memos only save work and never change an answer.
 */
export type { ActiveWindow, Occurrence, Schedule, ScheduleWindow, WindowMode } from "./types";
export { activeWindow, nextChange } from "./resolve";
export {
  HORIZON_MS,
  MAX_DURATION_MIN,
  activeAt,
  compileSchedule,
  covers,
  nextChangeAt,
  validateWindow,
  type CompiledSchedule,
} from "./compile";
export { expandRecurrence, validateRecurrence, type Check } from "./recurrence";
export { isTimeZone, toInstant, toLocal } from "./local-time";
