// How a thermometer app may write its times, and reading one time as written. A time
// is either an instant (Unix seconds, or ISO 8601 with Z or an offset) or wall-clock
// fields that still need the file's time zone (lib/readings-import/zone.ts).

export const DATE_FORMATS = ["iso", "dmy_slash", "mdy_slash", "dmy_dot", "unix"] as const;
export type DateFormat = (typeof DATE_FORMATS)[number];

/** How each format is offered, with an example of the same moment. */
export const DATE_FORMAT_LABELS: Record<DateFormat, string> = {
  iso: "2026-03-14 18:05:00 — year first (ISO 8601; a T, Z or +01:00 may follow)",
  dmy_slash: "14/03/2026 18:05:00 — day/month/year",
  mdy_slash: "03/14/2026 18:05:00 — month/day/year",
  dmy_dot: "14.03.2026 18:05:00 — day.month.year",
  unix: "1773511500 — seconds since 1970 (Unix time, always UTC)",
};

/** The pattern named in problems ("not in the format …"). */
export const DATE_FORMAT_PATTERNS: Record<DateFormat, string> = {
  iso: "YYYY-MM-DD HH:mm[:ss]",
  dmy_slash: "DD/MM/YYYY HH:mm[:ss]",
  mdy_slash: "MM/DD/YYYY HH:mm[:ss]",
  dmy_dot: "DD.MM.YYYY HH:mm[:ss]",
  unix: "Unix seconds",
};

export type WallClock = { year: number; month: number; day: number; hour: number; minute: number; second: number; millisecond: number };

export type ReadTime =
  | { kind: "instant"; ms: number }
  | { kind: "local"; wall: WallClock }
  | { kind: "bad"; reason: string };

const TIME = String.raw`(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,3})\d*)?)?`;
const ISO_RE = new RegExp(String.raw`^(\d{4})-(\d{2})-(\d{2})[T ]${TIME}\s*(Z|[+-]\d{2}(?::?\d{2})?)?$`, "i");
const SLASH_RE = new RegExp(String.raw`^(\d{1,2})/(\d{1,2})/(\d{4})[ T,]+${TIME}$`);
const DOT_RE = new RegExp(String.raw`^(\d{1,2})\.(\d{1,2})\.(\d{4})[ T,]+${TIME}$`);
const UNIX_RE = /^\d{1,16}(\.\d+)?$/;

const daysIn = (year: number, month: number) => new Date(Date.UTC(year, month, 0)).getUTCDate();

function wallClock(year: number, month: number, day: number, m: RegExpExecArray, at: number): WallClock | null {
  const hour = Number(m[at]);
  const minute = Number(m[at + 1]);
  const second = m[at + 2] === undefined ? 0 : Number(m[at + 2]);
  const millisecond = m[at + 3] === undefined ? 0 : Number(m[at + 3]!.padEnd(3, "0"));
  if (month < 1 || month > 12 || day < 1 || day > daysIn(year, month)) return null;
  if (hour > 23 || minute > 59 || second > 59) return null;
  return { year, month, day, hour, minute, second, millisecond };
}

/** "+01:00", "+0100", "+01" or "Z" as minutes east of UTC. */
function offsetMinutes(text: string): number | null {
  if (text.toUpperCase() === "Z") return 0;
  const m = /^([+-])(\d{2}):?(\d{2})?$/.exec(text);
  if (!m) return null;
  const minutes = Number(m[2]) * 60 + Number(m[3] ?? 0);
  return minutes > 18 * 60 ? null : (m[1] === "-" ? -1 : 1) * minutes;
}

const wallMs = (w: WallClock) => Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second, w.millisecond);

export function readTime(raw: string, format: DateFormat): ReadTime {
  const text = raw.trim();
  const notFormat: ReadTime = { kind: "bad", reason: `is not in the format ${DATE_FORMAT_PATTERNS[format]}` };
  if (text === "") return { kind: "bad", reason: "is empty" };
  if (format === "unix") {
    if (!UNIX_RE.test(text)) return notFormat;
    const seconds = Number(text);
    // Ten digits reach 2286; thirteen are milliseconds, which some apps write instead.
    if (seconds >= 1e11) return { kind: "bad", reason: "looks like milliseconds, not seconds since 1970" };
    return { kind: "instant", ms: Math.round(seconds * 1000) };
  }
  let m: RegExpExecArray | null;
  let wall: WallClock | null;
  if (format === "iso") {
    m = ISO_RE.exec(text);
    if (!m) return notFormat;
    wall = wallClock(Number(m[1]), Number(m[2]), Number(m[3]), m, 4);
    if (!wall) return { kind: "bad", reason: "is not a real date and time" };
    if (m[8] !== undefined) {
      const offset = offsetMinutes(m[8]);
      if (offset === null) return { kind: "bad", reason: `has an offset (${m[8]}) that is not one` };
      return { kind: "instant", ms: wallMs(wall) - offset * 60_000 };
    }
    return { kind: "local", wall };
  }
  m = (format === "dmy_dot" ? DOT_RE : SLASH_RE).exec(text);
  if (!m) return notFormat;
  const [first, second, year] = [Number(m[1]), Number(m[2]), Number(m[3])];
  wall = format === "mdy_slash" ? wallClock(year, first, second, m, 4) : wallClock(year, second, first, m, 4);
  if (!wall) return { kind: "bad", reason: "is not a real date and time" };
  return { kind: "local", wall };
}

/** Milliseconds of the wall clock read as if it were UTC (the zone is applied elsewhere). */
export { wallMs };
