import { describe, expect, it } from "vitest";
import { MIN_DIFFERENTIAL_C, planLimitIssues, planSchema, windowFormSchema, windowFormTimes, type PlanInput, type WindowInput } from "@/lib/schemas/schedule";
import { dayPieces, daysFromRecurrence, describeDays, describeTimes, durationBetween, findClashes, recurrenceFromDays } from "@/lib/schedules/week";
import { fieldErrors } from "@/lib/server/http";

const band = (days: WindowInput["days"], start: string, durationMin: number, lowC = 8, highC = 10): WindowInput => ({
  days,
  start,
  durationMin,
  mode: "band",
  lowC,
  highC,
});

const plan = (windows: WindowInput[], extra: Partial<PlanInput> = {}): PlanInput => ({
  name: "Weekly plan",
  windows,
  outsideWindows: "frost",
  frostLowC: 3,
  frostHighC: 5,
  validFrom: null,
  validUntil: null,
  skipDays: [],
  ...extra,
});

function errors(value: unknown): Record<string, string> {
  const parsed = planSchema.safeParse(value);
  return parsed.success ? {} : fieldErrors(parsed.error);
}

describe("overlapping windows", () => {
  it("windows that only touch do not clash, on the same day or across midnight", () => {
    expect(findClashes([band(["MO"], "06:00", 15 * 60), band(["MO"], "21:00", 9 * 60)])).toEqual([]);
    // 22:00 + 8 h closes at 06:00 the next day, when the day window opens.
    expect(findClashes([band(["MO", "TU"], "06:00", 16 * 60), band(["MO", "TU"], "22:00", 8 * 60)])).toEqual([]);
  });

  it("a window past midnight clashes with the next morning's window, named on that day", () => {
    const clashes = findClashes([band(["TU"], "05:00", 60), band(["MO"], "22:00", 8 * 60)]);
    expect(clashes).toEqual([{ a: 0, b: 1, day: "TU" }]);
  });

  it("Sunday night runs on into Monday morning: the week wraps", () => {
    expect(findClashes([band(["MO"], "05:00", 60), band(["SU"], "22:00", 8 * 60)])).toEqual([{ a: 0, b: 1, day: "MO" }]);
    expect(findClashes([band(["MO"], "06:00", 60), band(["SU"], "22:00", 8 * 60)])).toEqual([]);
  });

  it("checks each day of the window: a clash on one shared day only is found", () => {
    const clashes = findClashes([band(["MO", "WE", "FR"], "08:00", 120), band(["TU", "FR"], "09:00", 30)]);
    expect(clashes).toEqual([{ a: 0, b: 1, day: "FR" }]);
  });

  it("a window longer than the gap between its own days runs into itself", () => {
    expect(findClashes([band(["MO", "TU"], "18:00", 25 * 60)])).toEqual([{ a: 0, b: 0, day: "TU" }]);
    expect(findClashes([band(["MO", "TU"], "18:00", 24 * 60)])).toEqual([]);
    // A whole week on one day meets its own next opening exactly: touching.
    expect(findClashes([band(["MO"], "00:00", 7 * 24 * 60)])).toEqual([]);
  });

  it("the plan schema refuses a clash with a message naming the other window and the day", () => {
    const e = errors(plan([band(["MO", "TU"], "06:00", 15 * 60), band(["TU"], "20:00", 4 * 60)]));
    expect(e["windows.1"]).toBe(
      "Runs at the same time as window 1 (Mon, Tue 06:00–21:00) on Tuesday. Windows may touch but not overlap",
    );
  });
});

describe("a window's band", () => {
  it("low edge below high edge", () => {
    expect(errors(plan([band(["MO"], "06:00", 60, 10, 10)]))["windows.0.highC"]).toBe("The high edge must be above the low edge");
    expect(errors(plan([band(["MO"], "06:00", 60, 12, 10)]))["windows.0.highC"]).toBe("The high edge must be above the low edge");
  });

  it(`edges at least ${MIN_DIFFERENTIAL_C} °C apart (common practice, no published source)`, () => {
    expect(errors(plan([band(["MO"], "06:00", 60, 8, 8.5)]))["windows.0.highC"]).toMatch(/at least 1 °C \(1.8 °F\) apart/);
    expect(errors(plan([band(["MO"], "06:00", 60, 8, 9)]))).toEqual({});
  });

  it("a band needs both edges; on and off windows take none", () => {
    expect(errors(plan([{ ...band(["MO"], "06:00", 60), lowC: null }]))["windows.0.lowC"]).toMatch(/Give the low edge/);
    expect(errors(plan([{ ...band(["MO"], "06:00", 60), mode: "on" }]))["windows.0.mode"]).toMatch(/no band/);
    expect(errors(plan([{ ...band(["MO"], "06:00", 60), mode: "on", lowC: null, highC: null }]))).toEqual({});
  });

  it("edges are kept to 0.1 °C", () => {
    expect(errors(plan([band(["MO"], "06:00", 60, 8.25, 10)]))["windows.0.lowC"]).toMatch(/0.1 °C/);
  });
});

describe("a window's days and times", () => {
  it("needs a day, a real time and a length of at most a week", () => {
    expect(errors(plan([band([], "06:00", 60)]))["windows.0.days"]).toBe("Pick at least one day");
    expect(errors(plan([band(["MO", "MO"], "06:00", 60)]))["windows.0.days"]).toBe("A day is listed twice");
    expect(errors(plan([band(["MO"], "24:00", 60)]))["windows.0.start"]).toMatch(/HH:MM/);
    expect(errors(plan([band(["MO"], "06:00", 7 * 24 * 60 + 1)]))["windows.0.durationMin"]).toMatch(/at most a week/);
    expect(errors(plan([band(["MO"], "06:00", 0)]))["windows.0.durationMin"]).toMatch(/at least a minute/);
  });

  it("days go to and from the stored RRULE", () => {
    expect(recurrenceFromDays(["FR", "MO", "WE"])).toBe("FREQ=WEEKLY;BYDAY=MO,WE,FR");
    expect(daysFromRecurrence("FREQ=WEEKLY;BYDAY=SU,MO")).toEqual(["MO", "SU"]);
    expect(daysFromRecurrence("FREQ=DAILY")).toEqual(["MO", "TU", "WE", "TH", "FR", "SA", "SU"]);
    expect(daysFromRecurrence("FREQ=WEEKLY")).toBeNull();
  });

  it("an end at or before the start is the next day", () => {
    expect(durationBetween("22:00", "06:00")).toBe(8 * 60);
    expect(durationBetween("06:00", "06:00")).toBe(24 * 60);
    expect(durationBetween("06:00", "08:00", 1)).toBe(26 * 60);
    expect(windowFormTimes({ start: "06:00", durationMin: 26 * 60 })).toEqual({ start: "06:00", end: "08:00", extraDays: 1 });
    expect(windowFormTimes({ start: "22:00", durationMin: 8 * 60 })).toEqual({ start: "22:00", end: "06:00", extraDays: 0 });
  });

  it("describes days and times for people", () => {
    expect(describeDays(["MO", "TU", "WE", "TH", "FR"])).toBe("Mon–Fri");
    expect(describeDays(["SA", "SU"])).toBe("Sat, Sun");
    expect(describeDays(["MO", "WE", "TH", "FR"])).toBe("Mon, Wed–Fri");
    expect(describeTimes({ start: "22:00", durationMin: 480 })).toBe("22:00–06:00 next day");
    expect(describeTimes({ start: "18:00", durationMin: 360 })).toBe("18:00–24:00");
  });

  it("a window past midnight is drawn across the two days; Sunday's runs on into Monday", () => {
    expect(dayPieces([band(["SU"], "22:00", 8 * 60)])).toEqual([
      { index: 0, day: "SU", from: 22 * 60, until: 24 * 60, opensHere: true, closesHere: false },
      { index: 0, day: "MO", from: 0, until: 6 * 60, opensHere: false, closesHere: true },
    ]);
  });
});

describe("outside windows, season and skip days", () => {
  it("frost protection is a band under the same rules; off needs no edges", () => {
    expect(errors(plan([], { frostLowC: 5, frostHighC: 3 }))["frostHighC"]).toMatch(/above the low edge/);
    expect(errors(plan([], { frostLowC: null }))["frostLowC"]).toMatch(/Give the low edge/);
    expect(errors(plan([], { outsideWindows: "off", frostLowC: null, frostHighC: null }))).toEqual({});
  });

  it("the season ends on or after it starts", () => {
    expect(errors(plan([], { validFrom: "2026-10-01", validUntil: "2026-09-30" }))["validUntil"]).toMatch(/on or after/);
    expect(errors(plan([], { validFrom: "2026-10-01", validUntil: "2026-10-01" }))).toEqual({});
    expect(errors(plan([], { validFrom: "2026-02-30" }))["validFrom"]).toMatch(/not a date/);
  });

  it("a skip day is listed once", () => {
    const skip = { day: "2026-12-25", note: "Closed" };
    expect(errors(plan([], { skipDays: [skip, { ...skip, note: null }] }))["skipDays.1.day"]).toBe("2026-12-25 is listed twice");
  });
});

describe("the house's safety limits", () => {
  const limits = { lowLimitC: 2, highLimitC: 30 };
  it("names each edge outside them, with the limit in both units", () => {
    const issues = planLimitIssues(plan([band(["MO"], "06:00", 60, 1, 10), band(["TU"], "06:00", 60, 20, 30)]), limits);
    expect(issues).toEqual({
      "windows.0.lowC": "The low edge is below this house's frost limit of 2.0 °C (35.6 °F)",
      "windows.1.highC": "The high edge must be below this house's safety cut-out of 30.0 °C (86.0 °F)",
    });
    expect(planLimitIssues(plan([band(["MO"], "06:00", 60, 2, 29.9)]), limits)).toEqual({});
  });

  it("the frost band too, but not when outside windows is off", () => {
    expect(planLimitIssues(plan([], { frostLowC: 1, frostHighC: 3 }), limits)).toHaveProperty("frostLowC");
    expect(planLimitIssues(plan([], { outsideWindows: "off", frostLowC: 1, frostHighC: 3 }), limits)).toEqual({});
  });
});

describe("the window form", () => {
  it("turns °F edges and an end time into the stored window in °C", () => {
    const parsed = windowFormSchema("f").parse({ days: ["MO"], start: "22:00", end: "06:00", extraDays: 0, mode: "band", low: 46.4, high: 50 });
    expect(parsed).toEqual({ days: ["MO"], start: "22:00", durationMin: 480, mode: "band", lowC: 8, highC: 10 });
  });

  it("checks the differential in °C whatever unit is typed", () => {
    // 1 °F is 0.56 °C: narrower than the 1 °C minimum.
    const parsed = windowFormSchema("f").safeParse({ days: ["MO"], start: "06:00", end: "07:00", extraDays: 0, mode: "band", low: 46, high: 47 });
    expect(parsed.success).toBe(false);
    expect(fieldErrors(parsed.error!)["high"]).toMatch(/apart/);
  });

  it("refuses more than a week", () => {
    const parsed = windowFormSchema("c").safeParse({ days: ["MO"], start: "06:00", end: "07:00", extraDays: 6, mode: "on", low: null, high: null });
    expect(parsed.success).toBe(true);
    const tooLong = windowFormSchema("c").safeParse({ days: ["MO"], start: "06:00", end: "05:00", extraDays: 7, mode: "on", low: null, high: null });
    expect(tooLong.success).toBe(false);
  });
});
