import { describe, expect, it } from "vitest";
import type { PlanSegment } from "@/lib/control/plan";
import { bandSteps, bucketStarts, coveredMs, onPeriods, placeOnGrid, summarise, type SwitchRow } from "@/lib/house-chart";

const MIN = 60_000;
const t0 = Date.parse("2030-03-01T00:00:00Z");

describe("bucketStarts", () => {
  it("24 h: 288 five-minute buckets, the last one holding the end", () => {
    const end = Date.parse("2030-03-02T10:07:12Z");
    const starts = bucketStarts("24h", end);
    expect(starts).toHaveLength(288);
    expect(starts.at(-1)).toBe(Date.parse("2030-03-02T10:05:00Z"));
    expect(starts[1]! - starts[0]!).toBe(5 * MIN);
  });

  it("7 d: 336 half-hour buckets", () => {
    const starts = bucketStarts("7d", Date.parse("2030-03-08T00:00:00Z"));
    expect(starts).toHaveLength(336);
    expect(starts[0]).toBe(Date.parse("2030-03-01T00:30:00Z"));
  });
});

describe("placeOnGrid", () => {
  const grid = [t0, t0 + 5 * MIN, t0 + 10 * MIN];

  it("combines the roll-up and raw rows of one bucket weighted by samples; empty buckets are gaps", () => {
    const series = placeOnGrid(grid, [
      { bucketMs: t0, samples: 3, tempMeanC: 10, tempMinC: 9, tempMaxC: 11, rhMean: 80 },
      { bucketMs: t0, samples: 1, tempMeanC: 14, tempMinC: 14, tempMaxC: 14, rhMean: 60 },
      { bucketMs: t0 + 10 * MIN, samples: 2, tempMeanC: null, tempMinC: null, tempMaxC: null, rhMean: 55 },
    ]);
    expect(series.tempC).toEqual([11, null, null]);
    expect(series.tempMinC).toEqual([9, null, null]);
    expect(series.tempMaxC).toEqual([14, null, null]);
    expect(series.rh).toEqual([75, null, 55]);
  });

  it("drops rows outside the grid and rows without samples", () => {
    const series = placeOnGrid(grid, [
      { bucketMs: t0 - 5 * MIN, samples: 1, tempMeanC: 1, tempMinC: 1, tempMaxC: 1, rhMean: 1 },
      { bucketMs: t0 + 5 * MIN, samples: 0, tempMeanC: 1, tempMinC: 1, tempMaxC: 1, rhMean: 1 },
    ]);
    expect(series.tempC).toEqual([null, null, null]);
  });
});

describe("onPeriods", () => {
  const from = t0;
  const until = t0 + 24 * 60 * MIN;
  const at = (min: number) => new Date(t0 + min * MIN);
  const sw = (min: number, toOn: boolean, withdrawn = false): SwitchRow => ({ at: at(min), toOn, withdrawnAt: withdrawn ? at(min + 1) : null });

  it("a plug on before the range is on from its start", () => {
    expect(onPeriods(sw(-30, true), [sw(60, false)], from, until)).toEqual([{ from, until: t0 + 60 * MIN }]);
  });

  it("a plug off before the range starts off", () => {
    expect(onPeriods(sw(-30, false), [sw(60, true), sw(90, false)], from, until)).toEqual([{ from: t0 + 60 * MIN, until: t0 + 90 * MIN }]);
  });

  it("skips withdrawn switches: the plug stayed as it was", () => {
    const events = [sw(10, true), sw(20, false, true), sw(30, false), sw(40, true, true)];
    expect(onPeriods(null, events, from, until)).toEqual([{ from: t0 + 10 * MIN, until: t0 + 30 * MIN }]);
  });

  it("a withdrawn last switch before the range does not count", () => {
    expect(onPeriods(sw(-5, true, true), [], from, until)).toEqual([]);
  });

  it("still on at the end runs to the end; repeated ons do not restart the period", () => {
    expect(onPeriods(null, [sw(100, true), sw(120, true)], from, until)).toEqual([{ from: t0 + 100 * MIN, until }]);
  });

  it("sorts what it is given", () => {
    expect(onPeriods(null, [sw(30, false), sw(10, true)], from, until)).toEqual([{ from: t0 + 10 * MIN, until: t0 + 30 * MIN }]);
  });
});

describe("bandSteps", () => {
  it("keeps band windows and the frost default; overrides, on/off windows and off draw no band", () => {
    const seg = (a: number, b: number, rule: PlanSegment["rule"]): PlanSegment => ({ from: new Date(t0 + a * MIN), until: new Date(t0 + b * MIN), rule });
    const steps = bandSteps([
      seg(0, 60, { kind: "frost", lowC: 3, highC: 5 }),
      seg(60, 120, { kind: "window", scheduleId: "s", windowId: "w", mode: "band", lowC: 8, highC: 10 }),
      seg(120, 150, { kind: "override", overrideId: "o", on: true }),
      seg(150, 200, { kind: "window", scheduleId: "s", windowId: "w2", mode: "on" }),
      seg(200, 300, { kind: "off" }),
    ]);
    expect(steps).toEqual([
      { from: t0, until: t0 + 60 * MIN, lowC: 3, highC: 5, kind: "frost" },
      { from: t0 + 60 * MIN, until: t0 + 120 * MIN, lowC: 8, highC: 10, kind: "window" },
    ]);
  });
});

describe("summarise", () => {
  it("min, max and latest over the gaps", () => {
    expect(summarise([null, 4, 2, null, 7, 5, null])).toEqual({ min: 2, max: 7, latest: 5 });
    expect(summarise([null, null])).toEqual({ min: null, max: null, latest: null });
  });
});

describe("coveredMs", () => {
  it("counts overlapping periods once (two heaters on together)", () => {
    expect(coveredMs([{ from: 0, until: 10 }, { from: 5, until: 20 }, { from: 30, until: 40 }, { from: 32, until: 35 }])).toBe(30);
    expect(coveredMs([])).toBe(0);
  });
});
