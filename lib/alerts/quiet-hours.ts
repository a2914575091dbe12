// A member's quiet hours, read as wall-clock times in the site's time zone. They may run
// over midnight (22:00–07:00). On a clock-change day the end is the wall-clock time on
// that day; an end inside a spring-forward gap moves forward to the first time that
// exists (luxon's rule), so a hold never ends before the quiet hours would have.
import { DateTime } from "luxon";

export type QuietHours = { from: string; until: string };

function minutesOf(hhmm: string): number {
  const match = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(hhmm);
  if (!match) throw new RangeError(`"${hhmm}" is not a time of day (HH:MM)`);
  return Number(match[1]) * 60 + Number(match[2]);
}

/** Quiet hours from a member's stored choice: both ends set, or none. */
export function quietHoursOf(choice: { quietFrom: string | null; quietUntil: string | null }): QuietHours | null {
  return choice.quietFrom && choice.quietUntil ? { from: choice.quietFrom, until: choice.quietUntil } : null;
}

/**
 * When the quiet hours that `at` falls in end, as an instant; null when `at` is outside
 * them (or there are none). The start is included, the end is not.
 */
export function quietHoursEndAt(at: Date, quiet: QuietHours | null, zone: string): Date | null {
  if (!quiet) return null;
  const from = minutesOf(quiet.from);
  const until = minutesOf(quiet.until);
  if (from === until) return null;
  const local = DateTime.fromJSDate(at, { zone });
  if (!local.isValid) throw new RangeError(`"${zone}" is not a time zone`);
  const now = local.hour * 60 + local.minute;
  let endDay: DateTime;
  if (from < until) {
    if (now < from || now >= until) return null;
    endDay = local.startOf("day");
  } else if (now >= from) {
    endDay = local.startOf("day").plus({ days: 1 });
  } else if (now < until) {
    endDay = local.startOf("day");
  } else {
    return null;
  }
  const end = DateTime.fromObject(
    { year: endDay.year, month: endDay.month, day: endDay.day, hour: Math.floor(until / 60), minute: until % 60 },
    { zone },
  );
  return end.toJSDate();
}
