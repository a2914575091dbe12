import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { describeTrend, findTrend, periodFigures, type DayUse, type PeriodUse } from "@/lib/energy/degree-day-trend";
import {
  MIN_DAY_COVERAGE,
  dayTemperatures,
  dayWindows,
  degreeDays,
  expectedKwhPerKelvinDay,
  insideOutsideDegreeDays,
  ukMetOfficeDegreeDays,
  usMeanDegreeDays,
} from "@/lib/energy/degree-days";
import { daysFromTo } from "@/lib/energy/calendar";
import { fToC } from "@/lib/units";

describe("UK Met Office degree-days, base 15.5 °C", () => {
  // The four cases of the Met Office equations as tabulated in CIBSE TM41 "Degree-days:
  // theory and application" (2006); the figures are worked by hand from those equations.
  it("case 1, the whole day below the base: base − mean", () => {
    expect(ukMetOfficeDegreeDays(12, 4)).toBeCloseTo(7.5, 10); // 15.5 − (12 + 4) / 2
  });
  it("case 2, the high just above the base: (base − min)/2 − (max − base)/4", () => {
    expect(ukMetOfficeDegreeDays(18, 8)).toBeCloseTo(3.125, 10); // 7.5 / 2 − 2.5 / 4
  });
  it("case 3, the high well above the base: (base − min)/4", () => {
    expect(ukMetOfficeDegreeDays(25, 13)).toBeCloseTo(0.625, 10); // 2.5 / 4
  });
  it("case 4, the whole day at or above the base: 0", () => {
    expect(ukMetOfficeDegreeDays(22, 16)).toBe(0);
    expect(ukMetOfficeDegreeDays(15.5, 15.5)).toBe(0);
  });
  it("meets itself where one case hands over to the next (no jumps)", () => {
    fc.assert(
      fc.property(fc.double({ min: -30, max: 15.4, noNaN: true }), (minC) => {
        const atBase = ukMetOfficeDegreeDays(15.5, minC);
        expect(ukMetOfficeDegreeDays(15.5 + 1e-9, minC)).toBeCloseTo(atBase, 6);
        const mirror = 31 - minC; // max − base = base − min: cases 2 and 3 meet
        expect(ukMetOfficeDegreeDays(mirror - 1e-9, minC)).toBeCloseTo(ukMetOfficeDegreeDays(mirror, minC), 6);
      }),
    );
  });
  it("refuses a lowest above the highest, and non-numbers", () => {
    expect(() => ukMetOfficeDegreeDays(4, 12)).toThrow(/lowest/);
    expect(() => ukMetOfficeDegreeDays(Number.NaN, 1)).toThrow(/numbers/);
  });
});

describe("US heating degree-days, base 65 °F with the daily mean (max + min) / 2", () => {
  // NOAA Climate Prediction Center / National Weather Service definition: HDD = 65 °F − daily mean, never negative.
  it("mean 50 °F gives 15 °F·day", () => {
    expect(usMeanDegreeDays(60, 40)).toBe(15);
  });
  it("a mean above 65 °F gives 0", () => {
    expect(usMeanDegreeDays(70, 64)).toBe(0);
  });
  it("takes °C and works in °F through the site's method", () => {
    expect(degreeDays("us_mean", { maxC: fToC(60), minC: fToC(40) })).toBeCloseTo(15, 10);
    expect(degreeDays("uk_met_office", { maxC: 12, minC: 4 })).toBeCloseTo(7.5, 10);
  });
});

describe("inside–outside degree-days", () => {
  it("is the difference of the means where positive", () => {
    expect(insideOutsideDegreeDays(10, 4)).toBe(6);
    expect(insideOutsideDegreeDays(8, 9)).toBe(0);
  });
  it("a house of 100 W/K is expected to take 2.4 kWh per kelvin-day (100 W × 24 h)", () => {
    expect(expectedKwhPerKelvinDay(100)).toBeCloseTo(2.4, 10);
  });
});

describe("local days", () => {
  // IANA tz rules for Europe/London: summer time from 01:00 UTC on the last Sunday of
  // March to 01:00 UTC on the last Sunday of October (29 March and 25 October 2026).
  it("has 23 and 25 hours across the clock changes", () => {
    const windows = dayWindows("2026-03-28", "2026-03-30", "Europe/London");
    expect(windows.map((w) => w.minutes)).toEqual([1440, 1380, 1440]);
    expect(new Date(windows[1]!.startMs).toISOString()).toBe("2026-03-29T00:00:00.000Z");
    expect(new Date(windows[1]!.endMs).toISOString()).toBe("2026-03-29T23:00:00.000Z");
    expect(dayWindows("2026-10-25", "2026-10-25", "Europe/London")[0]!.minutes).toBe(1500);
  });
  it("refuses a range that runs backwards or is not dates", () => {
    expect(() => dayWindows("2026-03-30", "2026-03-28", "Europe/London")).toThrow(/after it ends/);
    expect(() => dayWindows("March", "2026-03-28", "Europe/London")).toThrow(/not a range/);
  });
  it("counts a day only with 75 % of its minutes read; otherwise it is missing, not 0", () => {
    expect(MIN_DAY_COVERAGE).toBe(0.75);
    const short = { minutes: 1380 };
    const enough = dayTemperatures({ minutesWithData: 1035, minC: 2, maxC: 9, meanC: 5 }, short);
    expect(enough).toEqual({ minC: 2, maxC: 9, meanC: 5, coverage: 0.75 });
    expect(dayTemperatures({ minutesWithData: 1034, minC: 2, maxC: 9, meanC: 5 }, short)).toBeNull();
    expect(dayTemperatures({ minutesWithData: 1079, minC: 2, maxC: 9, meanC: 5 }, { minutes: 1440 })).toBeNull();
    expect(dayTemperatures(undefined, short)).toBeNull();
  });
});

const weekDays = (monday: string, kwh: number, dd: number): DayUse[] =>
  daysFromTo(monday, monday.replace(/\d\d$/, (d) => String(Number(d) + 6).padStart(2, "0"))).map((day) => ({ day, kwh, degreeDays: dd }));

describe("kWh per degree-day over weeks", () => {
  it("is the week's kWh over its degree-days, counting only days with both", () => {
    const days: DayUse[] = [
      ...weekDays("2025-11-03", 12, 5),
      { day: "2025-11-10", kwh: 10, degreeDays: null },
      { day: "2025-11-11", kwh: null, degreeDays: 6 },
    ];
    const weeks = periodFigures(days, "week", "uk_met_office");
    expect(weeks[0]).toEqual({ key: "2025-11-03", days: 7, kwh: 84, degreeDays: 35, kwhPerDegreeDay: 84 / 35 });
    expect(weeks[1]).toEqual({ key: "2025-11-10", days: 0, kwh: 0, degreeDays: 0, kwhPerDegreeDay: null });
  });
  it("leaves out a week too mild to judge, and one with no heating at all", () => {
    const weeks = periodFigures(weekDays("2025-05-05", 1, 0.5), "week", "uk_met_office");
    expect(weeks[0]!.kwhPerDegreeDay).toBeNull();
    expect(periodFigures(weekDays("2025-10-06", 0, 4), "week", "uk_met_office")[0]!.kwhPerDegreeDay).toBeNull();
  });
});

const week = (key: string, ratio: number): PeriodUse => ({ key, days: 7, kwh: ratio * 50, degreeDays: 50, kwhPerDegreeDay: ratio });

describe("the change after insulation work", () => {
  it("finds a step down and says so in words", () => {
    const weeks = [
      week("2025-09-29", 2.45),
      week("2025-10-06", 2.35),
      week("2025-10-13", 2.4),
      week("2025-10-20", 2.42),
      week("2025-10-27", 2.38),
      week("2025-11-03", 1.82),
      week("2025-11-10", 1.78),
      week("2025-11-17", 1.8),
    ];
    const trend = findTrend(weeks);
    expect(trend).toMatchObject({ kind: "step", sinceKey: "2025-11-03", beforeWeeks: 5, afterWeeks: 3 });
    expect(describeTrend(trend)).toBe("Since 3 November this house has used 1.8 kWh per degree-day, down from 2.4 in the 5 weeks before.");
  });
  it("calls scatter without a step steady", () => {
    const weeks = ["2025-10-06", "2025-10-13", "2025-10-20", "2025-10-27", "2025-11-03", "2025-11-10"].map((k, i) => week(k, [2.1, 2.5, 1.9, 2.4, 2.0, 2.3][i]!));
    const trend = findTrend(weeks);
    expect(trend.kind).toBe("steady");
    expect(describeTrend(trend)).toBe("Since 6 October this house has used 2.2 kWh per degree-day, with no clear change over the 6 weeks.");
  });
  it("says plainly when there is nothing to judge", () => {
    expect(describeTrend(findTrend([{ key: "2025-06-02", days: 7, kwh: 1, degreeDays: 0, kwhPerDegreeDay: null }]))).toMatch(/^Not enough cold days/);
  });
});
