// Recurrence rules (RFC 5545 §3.3.10 RRULE values), checked and expanded on wall-clock
// fields. rrule is only ever given wall-clock ("floating") dates without a TZID, so it
// computes in UTC fields and the process's TZ never enters; the caller turns each local
// start into an instant in the site's zone (local-time.ts).
import * as rruleModule from "rrule";
import type { Options } from "rrule";
import { formatLocalDateTime, parseLocalDateTime } from "./local-time";

// `import { RRule } from "rrule"` fails under Node ESM (tsx): the package is CommonJS.
const { RRule } = (rruleModule as unknown as { default?: typeof rruleModule }).default ?? rruleModule;

export type Check = { ok: true } | { ok: false; error: string };

const WEEKDAYS = new Set(["MO", "TU", "WE", "TH", "FR", "SA", "SU"]);
const PART_RE = /^([A-Z]+)=([A-Z0-9,+-]+)$/;
export const MAX_RECURRENCE_LENGTH = 255;

/**
 * Whether `rule` is a recurrence a time window may store. Cloche supports the part of
 * RFC 5545 that a weekly plan needs, and refuses the rest rather than half-support it:
 *
 * - `FREQ=DAILY` or `FREQ=WEEKLY` (required); names and values are case-insensitive
 *   (RFC 5545 §3.1).
 * - `BYDAY` with plain weekdays (`MO`…`SU`, no ordinals such as `1MO`); required for
 *   WEEKLY, because a stored rule has no DTSTART to take the weekday from.
 * - `INTERVAL=1` only: without a DTSTART, "every other week" has no fixed first week.
 * - `WKST` is accepted; with INTERVAL=1 it changes nothing.
 * - No `DTSTART`, `COUNT` or `UNTIL`: the schedule's season bounds the windows.
 * - No `BYHOUR`/`BYMINUTE`/`BYSECOND`: the opening time is the window's start time.
 * - No `BYMONTH`, `BYMONTHDAY`, `BYYEARDAY`, `BYWEEKNO`, `BYSETPOS`: use the season and
 *   the skip days.
 */
export function validateRecurrence(rule: string): Check {
  if (typeof rule !== "string" || rule.trim() === "") return fail("The recurrence is empty");
  if (rule.length > MAX_RECURRENCE_LENGTH) return fail(`The recurrence is longer than ${MAX_RECURRENCE_LENGTH} characters`);
  if (/DTSTART|RRULE:|[:\s]/i.test(rule)) {
    return fail("Write the rule alone, without DTSTART, RRULE: or spaces, e.g. FREQ=WEEKLY;BYDAY=MO,WE,FR");
  }
  const parts = new Map<string, string>();
  for (const part of rule.toUpperCase().split(";")) {
    const m = PART_RE.exec(part);
    if (!m) return fail(`"${part}" is not a NAME=VALUE rule part`);
    if (parts.has(m[1]!)) return fail(`${m[1]} appears more than once`);
    parts.set(m[1]!, m[2]!);
  }
  const freq = parts.get("FREQ");
  if (freq === undefined) return fail("FREQ is required");
  if (freq !== "DAILY" && freq !== "WEEKLY") return fail("Only FREQ=DAILY and FREQ=WEEKLY are supported");

  for (const [name, value] of parts) {
    switch (name) {
      case "FREQ":
        break;
      case "BYDAY": {
        const days = value.split(",");
        if (days.some((day) => !WEEKDAYS.has(day))) return fail("BYDAY takes weekdays MO, TU, WE, TH, FR, SA, SU");
        if (new Set(days).size !== days.length) return fail("BYDAY names a weekday twice");
        break;
      }
      case "WKST":
        if (!WEEKDAYS.has(value)) return fail("WKST takes a weekday MO…SU");
        break;
      case "INTERVAL":
        if (value !== "1") return fail("Only INTERVAL=1 is supported: a window repeats every day or every week");
        break;
      case "COUNT":
      case "UNTIL":
        return fail(`${name} is not supported: set the schedule's season dates instead`);
      case "BYHOUR":
      case "BYMINUTE":
      case "BYSECOND":
        return fail(`${name} is not supported: the window's start time sets the time of day`);
      default:
        return fail(`${name} is not supported`);
    }
  }
  if (freq === "WEEKLY" && !parts.has("BYDAY")) return fail("FREQ=WEEKLY needs BYDAY, e.g. FREQ=WEEKLY;BYDAY=MO,TH");
  return { ok: true };
}

function fail(error: string): Check {
  return { ok: false, error };
}

/** A rule parsed once, ready to expand; any rule rrule understands (callers check product rules first). */
export type ParsedRule = { readonly options: Partial<Options> };

export function parseRule(rule: string): ParsedRule {
  return { options: RRule.parseString(rule.toUpperCase()) };
}

/**
 * Wall-clock starts of `rule` with the given wall-clock DTSTART, from `from` to `until`
 * (inclusive), or all of them when the rule is bounded by COUNT or UNTIL and no range is
 * given. All values are wall-clock ms; an UNTIL in the rule is read as wall-clock too.
 */
export function expandWallClock(rule: ParsedRule, dtstart: number, range?: { from: number; until: number }): number[] {
  const r = new RRule({ ...rule.options, dtstart: new Date(dtstart), tzid: null });
  if (range) return r.between(new Date(range.from), new Date(range.until), true).map((d) => d.getTime());
  if (rule.options.count == null && rule.options.until == null) {
    throw new RangeError("An unbounded rule needs a range to expand");
  }
  return r.all().map((d) => d.getTime());
}

/**
 * The same on strings, for checks against published examples: local date-times
 * "YYYY-MM-DDTHH:MM:SS" in, local date-times out.
 * `expandRecurrence("FREQ=WEEKLY;COUNT=2", "1997-09-02T09:00:00")` → ["1997-09-02T09:00:00", "1997-09-09T09:00:00"].
 */
export function expandRecurrence(rule: string, dtstart: string, range?: { from: string; until: string }): string[] {
  const wallRange = range && { from: parseLocalDateTime(range.from), until: parseLocalDateTime(range.until) };
  return expandWallClock(parseRule(rule), parseLocalDateTime(dtstart), wallRange).map(formatLocalDateTime);
}
