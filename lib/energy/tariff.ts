// Tariffs as the reports use them: which tariff is in force on a local date, and
// which of its unit rates covers each stretch of that day's wall clock.

import { WEEKDAYS, WEEKDAY_NAMES, type Weekday } from "@/lib/schedules/week";

/** RFC 5545 day codes, Monday first, as the schedules use them. */
export const WEEKDAY_CODES = WEEKDAYS;
export type WeekdayCode = Weekday;

export type TariffRate = {
  id: string;
  label: string;
  /** Local wall-clock time, "HH:MM" or "HH:MM:SS". */
  startsAt: string;
  /** Past midnight into the next day when not after `startsAt`. */
  endsAt: string;
  /** The days on which the rate's period starts. */
  days: readonly WeekdayCode[];
  pricePerKwh: number;
};

export type Tariff = {
  id: string;
  name: string;
  kind: "flat" | "time_of_use";
  /** First and last local date in force, inclusive; `validUntil` null for open-ended. */
  validFrom: string;
  validUntil: string | null;
  standingChargePerDay: number;
  taxPercent: number;
  rates: readonly TariffRate[];
};

/** Minutes after local midnight; "24:00" is the end of the day. */
export function minuteOfDay(clock: string): number {
  const [h = "0", m = "0", s = "0"] = clock.split(":");
  return Number(h) * 60 + Number(m) + Number(s) / 60;
}

/** The tariff in force on a local date (the one that started latest, should two overlap). */
export function tariffOn(tariffs: readonly Tariff[], day: string): Tariff | null {
  let found: Tariff | null = null;
  for (const t of tariffs) {
    if (t.validFrom > day || (t.validUntil !== null && t.validUntil < day)) continue;
    if (!found || t.validFrom > found.validFrom) found = t;
  }
  return found;
}

/** A stretch of one local day under one rate, in minutes after midnight; `rateId` "" where none applies. */
export type RatePiece = { fromMin: number; toMin: number; rateId: string };

/**
 * How a tariff divides a local day (weekday 1 = Monday … 7 = Sunday, as ISO 8601 and
 * luxon count). A rate that wraps past midnight covers the early hours of the day after
 * each of its days. Pieces are in order and cover the whole day; gaps get rate "".
 */
export function ratePiecesOfDay(tariff: Tariff | null, weekday: number): RatePiece[] {
  if (!tariff || tariff.rates.length === 0) return [{ fromMin: 0, toMin: 1440, rateId: "" }];
  if (tariff.kind === "flat") return [{ fromMin: 0, toMin: 1440, rateId: tariff.rates[0]!.id }];
  const covered = claimsOfDay(tariff.rates, weekday);
  const pieces: RatePiece[] = [];
  let at = 0;
  for (const c of covered) {
    if (c.toMin <= at) continue; // overlapping rates: the earlier-starting one keeps its time
    if (c.fromMin > at) pieces.push({ fromMin: at, toMin: c.fromMin, rateId: "" });
    pieces.push({ fromMin: Math.max(at, c.fromMin), toMin: c.toMin, rateId: c.rateId });
    at = c.toMin;
  }
  if (at < 1440) pieces.push({ fromMin: at, toMin: 1440, rateId: "" });
  // Neighbours under the same rate are one piece.
  return pieces.reduce<RatePiece[]>((out, p) => {
    const last = out[out.length - 1];
    if (last && last.rateId === p.rateId && last.toMin === p.fromMin) last.toMin = p.toMin;
    else out.push({ ...p });
    return out;
  }, []);
}

/**
 * What is wrong with a tariff's rates, in words, or an empty list. A flat tariff has
 * exactly one rate; a time-of-use tariff's rates cover every minute of the week once.
 */
export function tariffProblems(tariff: Pick<Tariff, "kind" | "rates">): string[] {
  if (tariff.rates.length === 0) return ["Add at least one unit rate."];
  if (tariff.kind === "flat") return tariff.rates.length === 1 ? [] : ["A flat tariff has one unit rate; choose time of use for more."];
  const problems: string[] = [];
  for (let weekday = 1; weekday <= 7; weekday++) {
    const code = WEEKDAY_CODES[weekday - 1]!;
    const claims = claimsOfDay(tariff.rates, weekday);
    for (let i = 1; i < claims.length; i++) {
      const a = claims[i - 1]!;
      const b = claims[i]!;
      if (b.fromMin < a.toMin) problems.push(`${a.label} and ${b.label} overlap on ${WEEKDAY_NAMES[code]} at ${clockOf(b.fromMin)}.`);
    }
    const gaps = ratePiecesOfDay({ kind: "time_of_use", rates: tariff.rates } as Tariff, weekday).filter((p) => p.rateId === "");
    for (const g of gaps) problems.push(`No rate covers ${WEEKDAY_NAMES[code]} ${clockOf(g.fromMin)}–${clockOf(g.toMin)}.`);
  }
  return problems;
}

/** Each rate's claim on a day, in order of start; claims may overlap or leave gaps. */
export function claimsOfDay(rates: readonly TariffRate[], weekday: number) {
  const today = WEEKDAY_CODES[weekday - 1]!;
  const yesterday = WEEKDAY_CODES[(weekday + 5) % 7]!;
  const claims: (RatePiece & { label: string })[] = [];
  for (const rate of rates) {
    const start = minuteOfDay(rate.startsAt);
    const end = minuteOfDay(rate.endsAt);
    const wraps = end <= start;
    const claim = { rateId: rate.id, label: rate.label };
    if (rate.days.includes(today)) claims.push({ fromMin: start, toMin: wraps ? 1440 : end, ...claim });
    if (wraps && end > 0 && rate.days.includes(yesterday)) claims.push({ fromMin: 0, toMin: end, ...claim });
  }
  return claims.sort((a, b) => a.fromMin - b.fromMin);
}

function clockOf(min: number) {
  const h = Math.floor(min / 60);
  const m = Math.round(min % 60);
  return `${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}`;
}
