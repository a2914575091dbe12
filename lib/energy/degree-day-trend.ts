// kWh per degree-day of a house over weeks and months, and whether it changed: the
// figure that shows if insulation work (bubble wrap, a second skin, a fixed door) paid off.
// Each period's figure is its kWh over its degree-days (a ratio of sums, so a mild day
// with a few kWh cannot swing it), counting only days that have both.
import { DateTime } from "luxon";
import type { DegreeDayMethod } from "../domain";
import { bucketOf } from "./report";

export type DayUse = { day: string; kwh: number | null; degreeDays: number | null };

export type PeriodUse = {
  key: string;
  /** Days of the period with both kWh and degree-days. */
  days: number;
  kwh: number;
  degreeDays: number;
  /** Null when the period had too few counted days or too little cold to judge. */
  kwhPerDegreeDay: number | null;
};

export type TrendBucket = "week" | "month";

/**
 * Least counted days and least degree-days for a period's figure to mean something.
 * Common practice, no published source: below about one degree-day a day the heating
 * mostly answers to sun and wind, not to the cold.
 */
export const PERIOD_RULES: Record<TrendBucket, { minDays: number; minDegreeDaysPerDay: Record<DegreeDayMethod, number> }> = {
  week: { minDays: 4, minDegreeDaysPerDay: { uk_met_office: 1, us_mean: 1.8 } },
  month: { minDays: 14, minDegreeDaysPerDay: { uk_met_office: 1, us_mean: 1.8 } },
};

export function periodFigures(days: readonly DayUse[], bucket: TrendBucket, method: DegreeDayMethod): PeriodUse[] {
  const rules = PERIOD_RULES[bucket];
  const periods = new Map<string, PeriodUse>();
  for (const d of days) {
    const key = bucketOf(d.day, bucket);
    const p = periods.get(key) ?? { key, days: 0, kwh: 0, degreeDays: 0, kwhPerDegreeDay: null };
    periods.set(key, p);
    if (d.kwh === null || d.degreeDays === null) continue;
    p.days += 1;
    p.kwh += d.kwh;
    p.degreeDays += d.degreeDays;
  }
  return [...periods.values()]
    .sort((a, b) => (a.key < b.key ? -1 : 1))
    .map((p) => ({
      ...p,
      kwhPerDegreeDay:
        // A week without any heating (the band was never reached) says nothing about the cover.
        p.days >= rules.minDays && p.kwh > 0 && p.degreeDays > 0 && p.degreeDays >= rules.minDegreeDaysPerDay[method] * p.days ? p.kwh / p.degreeDays : null,
    }));
}

export type Trend =
  | { kind: "none" }
  | { kind: "steady"; weeks: number; fromKey: string; kwhPerDegreeDay: number }
  | { kind: "step"; sinceKey: string; before: number; beforeWeeks: number; after: number; afterWeeks: number };

/** Least weeks on each side of a step, and least relative change, for it to be called one (common practice, no published source). */
export const STEP_RULES = { minWeeksEachSide: 2, minRelativeChange: 0.15 };

const ratioOf = (weeks: readonly PeriodUse[]) => {
  const dd = weeks.reduce((s, w) => s + w.degreeDays, 0);
  return dd > 0 ? weeks.reduce((s, w) => s + w.kwh, 0) / dd : 0;
};

/**
 * The single step in the weekly figures that explains them best (least squares over
 * every split), kept only when it is large against the weeks' own scatter: the change
 * must be at least STEP_RULES.minRelativeChange and over twice its standard error.
 */
export function findTrend(weeks: readonly PeriodUse[]): Trend {
  const usable = weeks.filter((w) => w.kwhPerDegreeDay !== null);
  if (usable.length === 0) return { kind: "none" };
  const values = usable.map((w) => w.kwhPerDegreeDay!);
  const steady: Trend = { kind: "steady", weeks: usable.length, fromKey: usable[0]!.key, kwhPerDegreeDay: ratioOf(usable) };
  const n = usable.length;
  const k0 = STEP_RULES.minWeeksEachSide;
  let best: { k: number; sse: number } | null = null;
  for (let k = k0; k <= n - k0; k++) {
    const sse = squaredSpread(values.slice(0, k)) + squaredSpread(values.slice(k));
    if (!best || sse < best.sse) best = { k, sse };
  }
  if (!best) return steady;
  const beforeWeeks = usable.slice(0, best.k);
  const afterWeeks = usable.slice(best.k);
  const before = ratioOf(beforeWeeks);
  const after = ratioOf(afterWeeks);
  const change = Math.abs(after - before);
  if (before <= 0 || change / before < STEP_RULES.minRelativeChange) return steady;
  const pooledVariance = best.sse / Math.max(1, n - 2);
  const standardError = Math.sqrt(pooledVariance * (1 / beforeWeeks.length + 1 / afterWeeks.length));
  if (change <= 2 * standardError) return steady;
  return { kind: "step", sinceKey: afterWeeks[0]!.key, before, beforeWeeks: beforeWeeks.length, after, afterWeeks: afterWeeks.length };
}

function squaredSpread(values: number[]) {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  return values.reduce((s, v) => s + (v - mean) ** 2, 0);
}

const figure = (v: number) => (v >= 10 ? v.toFixed(0) : v.toFixed(1));
const longDate = (day: string) => DateTime.fromISO(day, { zone: "UTC" }).toFormat("d LLLL");
const weeksWord = (n: number) => (n === 1 ? "week" : `${n} weeks`);

/** The trend in one plain sentence about "this house". */
export function describeTrend(trend: Trend): string {
  switch (trend.kind) {
    case "none":
      return "Not enough cold days with both readings and heating yet to work out kWh per degree-day.";
    case "steady":
      return `Since ${longDate(trend.fromKey)} this house has used ${figure(trend.kwhPerDegreeDay)} kWh per degree-day, with no clear change over the ${weeksWord(trend.weeks)}.`;
    case "step": {
      const direction = trend.after < trend.before ? "down" : "up";
      return `Since ${longDate(trend.sinceKey)} this house has used ${figure(trend.after)} kWh per degree-day, ${direction} from ${figure(trend.before)} in the ${weeksWord(trend.beforeWeeks)} before.`;
    }
  }
}
