// A time-of-use tariff's week as the editor draws it: for each day, the stretches of
// the wall clock under each rate, the stretches no rate covers and those two rates
// claim, in minutes after local midnight. The reading of the rates is the reports' own
// (claimsOfDay, ratePiecesOfDay), so what the picture shows is what a report costs.
import { claimsOfDay, ratePiecesOfDay, type Tariff, type TariffRate } from "@/lib/energy/tariff";
import { WEEKDAYS, WEEKDAY_NAMES, describeDays, type Weekday } from "@/lib/schedules/week";

/** `rate` is the rate's place in the list; null where no rate applies. */
export type WeekPiece = { fromMin: number; toMin: number; rate: number | null };
/** A stretch two rates claim, with their places in the list. */
export type Doubled = { fromMin: number; toMin: number; rates: [number, number] };
export type WeekDayRow = { day: Weekday; name: string; pieces: WeekPiece[]; doubled: Doubled[] };

export type DraftRate = Pick<TariffRate, "label" | "startsAt" | "endsAt" | "days">;

const CLOCK_RE = /^([01]\d|2[0-3]):[0-5]\d(:[0-5]\d)?$/;

/** Rates with a start and end the picture can read (a half-typed rate is left out). */
function readable(rates: readonly DraftRate[]): TariffRate[] {
  return rates.flatMap((r, i) =>
    CLOCK_RE.test(r.startsAt) && CLOCK_RE.test(r.endsAt) && Array.isArray(r.days) ? [{ ...r, id: String(i), pricePerKwh: 0 }] : [],
  );
}

export function tariffWeek(kind: Tariff["kind"], rates: readonly DraftRate[]): WeekDayRow[] {
  const usable = readable(rates);
  const tariff = { kind, rates: usable } as unknown as Tariff;
  return WEEKDAYS.map((day, i) => {
    const weekday = i + 1;
    const pieces = ratePiecesOfDay(tariff, weekday).map((p) => ({ fromMin: p.fromMin, toMin: p.toMin, rate: p.rateId === "" ? null : Number(p.rateId) }));
    const doubled: Doubled[] = [];
    if (kind === "time_of_use") {
      const claims = claimsOfDay(usable, weekday);
      for (let a = 0; a < claims.length; a++) {
        for (let b = a + 1; b < claims.length; b++) {
          const fromMin = Math.max(claims[a]!.fromMin, claims[b]!.fromMin);
          const toMin = Math.min(claims[a]!.toMin, claims[b]!.toMin);
          if (fromMin < toMin) doubled.push({ fromMin, toMin, rates: [Number(claims[a]!.rateId), Number(claims[b]!.rateId)] });
        }
      }
    }
    return { day, name: WEEKDAY_NAMES[day], pieces, doubled };
  });
}

/** "07:30" for minutes after midnight; the end of the day is "24:00". */
export function clockText(min: number): string {
  const h = Math.floor(min / 60);
  const m = Math.round(min % 60);
  return `${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}`;
}

/** A day of the picture in words: "Night 00:00–07:30, Day 07:30–24:00, no rate 12:00–13:00, Day and Boost both 06:00–07:00". */
export function describeDayRow(row: WeekDayRow, labels: readonly string[]): string {
  const parts = row.pieces.map((p) => `${p.rate === null ? "no rate" : labels[p.rate] || `Rate ${p.rate + 1}`} ${clockText(p.fromMin)}–${clockText(p.toMin)}`);
  const doubled = row.doubled.map((d) => `${labels[d.rates[0]]} and ${labels[d.rates[1]]} both ${clockText(d.fromMin)}–${clockText(d.toMin)}`);
  return [...parts, ...doubled].join(", ");
}

/**
 * What keeps the week from being covered once, with the days that share the same
 * stretch told together: "No rate covers 23:00–24:00 (Every day)".
 */
export function coverageProblems(rows: readonly WeekDayRow[], labels: readonly string[]): string[] {
  const grouped = new Map<string, Weekday[]>();
  const add = (text: string, day: Weekday) => grouped.set(text, [...(grouped.get(text) ?? []), day]);
  for (const row of rows) {
    for (const p of row.pieces) if (p.rate === null) add(`No rate covers ${clockText(p.fromMin)}–${clockText(p.toMin)}`, row.day);
    for (const d of row.doubled) add(`${labels[d.rates[0]]} and ${labels[d.rates[1]]} both cover ${clockText(d.fromMin)}–${clockText(d.toMin)}`, row.day);
  }
  return [...grouped].map(([text, days]) => `${text} (${describeDays(days)}).`);
}
