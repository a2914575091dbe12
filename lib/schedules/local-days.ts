// Instants shown on the wall clock of the site's zone, and a preview's segments laid out
// by local day, for drawing. Intl only (no luxon) so that it stays small in the browser.
import type { PreviewSegment } from "./preview";

export type LocalParts = { date: string; minutes: number; weekday: string; dayLabel: string; time: string };

const formatters = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string) {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      hourCycle: "h23",
      weekday: "short",
    });
    formatters.set(timeZone, f);
  }
  return f;
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

export function localParts(iso: string, timeZone: string): LocalParts {
  const parts = Object.fromEntries(formatter(timeZone).formatToParts(new Date(iso)).map((p) => [p.type, p.value]));
  const time = `${parts.hour}:${parts.minute}`;
  return {
    date: `${parts.year}-${parts.month}-${parts.day}`,
    minutes: Number(parts.hour) * 60 + Number(parts.minute),
    weekday: parts.weekday!,
    dayLabel: `${parts.weekday} ${Number(parts.day)} ${MONTHS[Number(parts.month) - 1]}`,
    time,
  };
}

function nextDate(date: string): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

export type DayRow = { date: string; label: string; pieces: { from: number; until: number; segment: number }[] };

/** Each segment cut at local midnights into pieces of minutes after local midnight, row by local date. */
export function segmentsByLocalDay(segments: PreviewSegment[], timeZone: string): DayRow[] {
  const rows = new Map<string, DayRow>();
  const row = (date: string, label: string) => {
    let r = rows.get(date);
    if (!r) rows.set(date, (r = { date, label, pieces: [] }));
    return r;
  };
  segments.forEach((s, i) => {
    const a = localParts(s.from, timeZone);
    const b = localParts(s.until, timeZone);
    let date = a.date;
    let from = a.minutes;
    let label = a.dayLabel;
    for (let guard = 0; guard < 10; guard++) {
      if (date === b.date) {
        if (b.minutes > from) row(date, label).pieces.push({ from, until: b.minutes, segment: i });
        break;
      }
      row(date, label).pieces.push({ from, until: 24 * 60, segment: i });
      date = nextDate(date);
      from = 0;
      const d = new Date(`${date}T12:00:00Z`);
      label = `${d.toLocaleDateString("en-GB", { weekday: "short", timeZone: "UTC" })} ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
    }
  });
  return [...rows.values()];
}
