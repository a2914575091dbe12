// The shape of a house's chart: readings averaged into fixed buckets (a few hundred
// points whatever the range), the band in force over time, and the heater's on-periods
// from the switch log. Pure, so the route handler and the tests share it.
import type { PlanSegment } from "./control/plan";

export const CHART_RANGES = {
  "24h": { label: "24 hours", spanMs: 24 * 3600_000, bucketMs: 5 * 60_000 },
  "7d": { label: "7 days", spanMs: 7 * 24 * 3600_000, bucketMs: 30 * 60_000 },
} as const;

export type ChartRange = keyof typeof CHART_RANGES;
export const CHART_RANGE_KEYS = Object.keys(CHART_RANGES) as ChartRange[];

/** The bucket starts (ms) of a range ending at `untilMs`: whole buckets, the last one holding `untilMs`. */
export function bucketStarts(range: ChartRange, untilMs: number): number[] {
  const { spanMs, bucketMs } = CHART_RANGES[range];
  const last = Math.floor(untilMs / bucketMs) * bucketMs;
  const first = last - spanMs + bucketMs;
  const starts: number[] = [];
  for (let t = first; t <= last; t += bucketMs) starts.push(t);
  return starts;
}

/** One source's summary of one bucket (per-minute roll-up or raw readings). */
export type BucketRow = {
  bucketMs: number;
  samples: number;
  tempMeanC: number | null;
  tempMinC: number | null;
  tempMaxC: number | null;
  rhMean: number | null;
};

export type ChartSeries = {
  tempC: (number | null)[];
  tempMinC: (number | null)[];
  tempMaxC: (number | null)[];
  rh: (number | null)[];
};

const round2 = (v: number) => Math.round(v * 100) / 100;

/**
 * The rows laid on the grid of bucket starts: rows of the same bucket (roll-up and raw)
 * combine weighted by their samples; a bucket without readings is null (a gap, not a zero).
 */
export function placeOnGrid(starts: number[], rows: BucketRow[]): ChartSeries {
  const index = new Map(starts.map((t, i) => [t, i]));
  const n = starts.length;
  const acc = Array.from({ length: n }, () => ({ tw: 0, tSum: 0, rw: 0, rSum: 0, min: Infinity, max: -Infinity }));
  for (const row of rows) {
    const i = index.get(row.bucketMs);
    if (i === undefined || row.samples <= 0) continue;
    const a = acc[i]!;
    if (row.tempMeanC !== null) {
      a.tw += row.samples;
      a.tSum += row.tempMeanC * row.samples;
    }
    if (row.rhMean !== null) {
      a.rw += row.samples;
      a.rSum += row.rhMean * row.samples;
    }
    if (row.tempMinC !== null) a.min = Math.min(a.min, row.tempMinC);
    if (row.tempMaxC !== null) a.max = Math.max(a.max, row.tempMaxC);
  }
  return {
    tempC: acc.map((a) => (a.tw ? round2(a.tSum / a.tw) : null)),
    tempMinC: acc.map((a) => (Number.isFinite(a.min) ? a.min : null)),
    tempMaxC: acc.map((a) => (Number.isFinite(a.max) ? a.max : null)),
    rh: acc.map((a) => (a.rw ? round2(a.rSum / a.rw) : null)),
  };
}

export type SwitchRow = { at: Date; toOn: boolean; withdrawnAt: Date | null };
export type Period = { from: number; until: number };

/**
 * When a plug was on between `fromMs` and `untilMs`: `before` is its last switch before
 * the range (so a plug already on at the start counts from the start), `events` those
 * inside it. Withdrawn switches (replaced before the plug confirmed them) are skipped:
 * the plug stayed as it was.
 */
export function onPeriods(before: SwitchRow | null, events: SwitchRow[], fromMs: number, untilMs: number): Period[] {
  const kept = events.filter((e) => e.withdrawnAt === null).sort((a, b) => a.at.getTime() - b.at.getTime());
  const periods: Period[] = [];
  let onSince: number | null = before && before.withdrawnAt === null && before.toOn ? fromMs : null;
  for (const e of kept) {
    const at = Math.min(Math.max(e.at.getTime(), fromMs), untilMs);
    if (e.toOn && onSince === null) onSince = at;
    else if (!e.toOn && onSince !== null) {
      if (at > onSince) periods.push({ from: onSince, until: at });
      onSince = null;
    }
  }
  if (onSince !== null && untilMs > onSince) periods.push({ from: onSince, until: untilMs });
  return periods;
}

export type BandStep = { from: number; until: number; lowC: number | null; highC: number | null; kind: "window" | "frost" };

/** The band edges over time from a plug's plan: band windows and the frost default; other rules draw no band. */
export function bandSteps(segments: PlanSegment[]): BandStep[] {
  return segments.flatMap(({ from, until, rule }): BandStep[] => {
    if (rule.kind === "frost") return [{ from: from.getTime(), until: until.getTime(), lowC: rule.lowC, highC: rule.highC, kind: "frost" }];
    if (rule.kind === "window" && rule.mode === "band") {
      return [{ from: from.getTime(), until: until.getTime(), lowC: rule.lowC, highC: rule.highC, kind: "window" }];
    }
    return [];
  });
}

export type SeriesSummary = { min: number | null; max: number | null; latest: number | null };

/** Lowest, highest and latest value of a series with gaps, for the words beside the chart. */
export function summarise(values: (number | null)[]): SeriesSummary {
  let min: number | null = null;
  let max: number | null = null;
  let latest: number | null = null;
  for (const v of values) {
    if (v === null) continue;
    min = min === null ? v : Math.min(min, v);
    max = max === null ? v : Math.max(max, v);
    latest = v;
  }
  return { min, max, latest };
}

/** Total time covered by periods that may overlap (two heaters on together count once). */
export function coveredMs(periods: { from: number; until: number }[]): number {
  const sorted = [...periods].sort((a, b) => a.from - b.from);
  let total = 0;
  let end = -Infinity;
  for (const p of sorted) {
    const start = Math.max(p.from, end);
    if (p.until > start) total += p.until - start;
    end = Math.max(end, p.until);
  }
  return total;
}
