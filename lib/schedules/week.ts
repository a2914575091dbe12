// A plug's weekly plan as the editor sees it: windows on days of the week with a local
// start time and a length, laid on a week of wall-clock minutes (Monday 00:00 = 0).
// Stored as RRULEs (FREQ=WEEKLY;BYDAY=…) for lib/schedule; times are the site's local
// times, which is also how lib/schedule closes a window (start + length on the wall
// clock), so overlaps judged here are the overlaps the controller would meet.

export const WEEKDAYS = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"] as const;
export type Weekday = (typeof WEEKDAYS)[number];

export const WEEKDAY_NAMES: Record<Weekday, string> = {
  MO: "Monday",
  TU: "Tuesday",
  WE: "Wednesday",
  TH: "Thursday",
  FR: "Friday",
  SA: "Saturday",
  SU: "Sunday",
};

export const WEEKDAY_SHORT: Record<Weekday, string> = {
  MO: "Mon",
  TU: "Tue",
  WE: "Wed",
  TH: "Thu",
  FR: "Fri",
  SA: "Sat",
  SU: "Sun",
};

export const DAY_MIN = 24 * 60;
export const WEEK_MIN = 7 * DAY_MIN;
/** The grid and the keyboard move windows in steps of this many minutes. */
export const SNAP_MIN = 15;

/** The week-shaped part of a window, what overlap and drawing need. */
export type WeekWindow = { days: Weekday[]; start: string; durationMin: number };

export function sortDays(days: readonly Weekday[]): Weekday[] {
  return WEEKDAYS.filter((d) => days.includes(d));
}

export function recurrenceFromDays(days: readonly Weekday[]): string {
  return `FREQ=WEEKLY;BYDAY=${sortDays(days).join(",")}`;
}

/** The weekdays a stored rule opens on: FREQ=DAILY is every day; null when the rule is not one the editor shows. */
export function daysFromRecurrence(rule: string): Weekday[] | null {
  const parts = new Map(
    rule
      .toUpperCase()
      .split(";")
      .map((p) => p.split("=") as [string, string]),
  );
  const freq = parts.get("FREQ");
  if (freq === "DAILY" && !parts.has("BYDAY")) return [...WEEKDAYS];
  const byday = parts.get("BYDAY");
  if (!byday) return null;
  const days = byday.split(",");
  if (!days.every((d): d is Weekday => (WEEKDAYS as readonly string[]).includes(d))) return null;
  return sortDays(days);
}

/** "HH:MM" (or "HH:MM:SS") → minutes after local midnight. */
export function minutesOf(time: string): number {
  const [h, m] = time.split(":").map(Number);
  return h! * 60 + m!;
}

/** Minutes after midnight (any whole number; wraps at 24 h) → "HH:MM". */
export function timeOf(minutes: number): string {
  const m = ((minutes % DAY_MIN) + DAY_MIN) % DAY_MIN;
  return `${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
}

/** Minutes from a start time to an end time on the wall clock; an end at or before the start is the next day. */
export function durationBetween(start: string, end: string, extraDays = 0): number {
  const d = (((minutesOf(end) - minutesOf(start)) % DAY_MIN) + DAY_MIN) % DAY_MIN;
  return (d === 0 ? DAY_MIN : d) + extraDays * DAY_MIN;
}

export function formatDuration(minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

/** One opening of a window in the week: [start, end) in week minutes; end may pass the week's end. */
export type Occurrence = { index: number; day: Weekday; start: number; end: number };

export function occurrences(windows: readonly WeekWindow[]): Occurrence[] {
  return windows.flatMap((w, index) =>
    sortDays(w.days).map((day) => {
      const start = WEEKDAYS.indexOf(day) * DAY_MIN + minutesOf(w.start);
      return { index, day, start, end: start + w.durationMin };
    }),
  );
}

export type Clash = {
  /** The windows (their places in the list); `a` < `b`, or equal when a window meets itself on another day. */
  a: number;
  b: number;
  /** The weekday on which the two first run at once. */
  day: Weekday;
};

const mod = (n: number, m: number) => ((n % m) + m) % m;

/**
 * Pairs of windows that run at the same time somewhere in the week, each pair once,
 * with the day it begins. The week repeats, so Sunday 22:00 + 8 h meets Monday 05:00.
 * Windows that only touch (one closes as the other opens) do not clash: a window is in
 * force up to, not including, its closing time (lib/schedule).
 */
export function findClashes(windows: readonly WeekWindow[]): Clash[] {
  const occ = occurrences(windows);
  const seen = new Set<string>();
  const clashes: Clash[] = [];
  for (let i = 0; i < occ.length; i++) {
    for (let j = i + 1; j < occ.length; j++) {
      const p = occ[i]!;
      const q = occ[j]!;
      // How far q opens after p, and p after q, going round the week.
      const qAfterP = mod(q.start - p.start, WEEK_MIN);
      const pAfterQ = mod(p.start - q.start, WEEK_MIN);
      let begins: number | null = null;
      if (qAfterP < p.end - p.start) begins = q.start;
      else if (pAfterQ < q.end - q.start) begins = p.start;
      if (begins === null) continue;
      const [a, b] = p.index <= q.index ? [p.index, q.index] : [q.index, p.index];
      const key = `${a}:${b}`;
      if (seen.has(key)) continue;
      seen.add(key);
      clashes.push({ a, b, day: WEEKDAYS[Math.floor(mod(begins, WEEK_MIN) / DAY_MIN)]! });
    }
  }
  return clashes;
}

/** A piece of a window drawn in one day's column: minutes after that day's midnight. */
export type DayPiece = { index: number; day: Weekday; from: number; until: number; opensHere: boolean; closesHere: boolean };

/** Each window cut at midnights into the days it covers (Sunday runs on into Monday). */
export function dayPieces(windows: readonly WeekWindow[]): DayPiece[] {
  const pieces: DayPiece[] = [];
  for (const o of occurrences(windows)) {
    let cursor = o.start;
    while (cursor < o.end) {
      const dayStart = Math.floor(cursor / DAY_MIN) * DAY_MIN;
      const until = Math.min(o.end, dayStart + DAY_MIN);
      pieces.push({
        index: o.index,
        day: WEEKDAYS[mod(dayStart / DAY_MIN, 7)]!,
        from: cursor - dayStart,
        until: until - dayStart,
        opensHere: cursor === o.start,
        closesHere: until === o.end,
      });
      cursor = until;
    }
  }
  return pieces;
}

/** "Every day", "Mon–Fri", "Sat, Sun", "Mon, Wed–Fri". */
export function describeDays(days: readonly Weekday[]): string {
  const idx = sortDays(days).map((d) => WEEKDAYS.indexOf(d));
  if (idx.length === 7) return "Every day";
  if (idx.length === 0) return "No days";
  const runs: [number, number][] = [];
  for (const i of idx) {
    const last = runs.at(-1);
    if (last && last[1] === i - 1) last[1] = i;
    else runs.push([i, i]);
  }
  return runs
    .map(([a, b]) => {
      const name = (i: number) => WEEKDAY_SHORT[WEEKDAYS[i]!];
      if (a === b) return name(a);
      return b === a + 1 ? `${name(a)}, ${name(b)}` : `${name(a)}–${name(b)}`;
    })
    .join(", ");
}

/** "06:00–21:00", "22:00–06:00 next day", "18:00 for 2 days 4 h". */
export function describeTimes(w: Pick<WeekWindow, "start" | "durationMin">): string {
  const end = timeOf(minutesOf(w.start) + w.durationMin);
  const endMin = minutesOf(w.start) + w.durationMin;
  const endDay = Math.floor(endMin / DAY_MIN);
  if (endMin === DAY_MIN) return `${w.start}–24:00`;
  if (endDay === 0) return `${w.start}–${end}`;
  if (endDay === 1) return `${w.start}–${end} next day`;
  return `${w.start}–${end} ${endDay} days later`;
}
