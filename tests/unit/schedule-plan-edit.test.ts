import { describe, expect, it } from "vitest";
import type { PlanInput, WindowInput } from "@/lib/schemas/schedule";
import { copyDay, moveWindow, planReducer, resizeWindow } from "@/lib/schedules/edit";
import { clockChangeDays } from "@/lib/schedules/plan";

const w = (days: WindowInput["days"], start: string, durationMin: number, mode: WindowInput["mode"] = "on"): WindowInput => ({
  days,
  start,
  durationMin,
  mode,
  lowC: null,
  highC: null,
});

describe("editing a draft plan", () => {
  it("a move wraps round midnight and round the week, on every day of the window", () => {
    expect(moveWindow(w(["MO", "TU"], "00:15", 60), -30, 0)).toMatchObject({ days: ["MO", "SU"], start: "23:45" });
    expect(moveWindow(w(["SU"], "23:00", 60), 90, 0)).toMatchObject({ days: ["MO"], start: "00:30" });
    expect(moveWindow(w(["FR", "SA"], "06:00", 60), 0, 2)).toMatchObject({ days: ["MO", "SU"], start: "06:00" });
  });

  it("a resize keeps a window from 15 minutes to a week", () => {
    expect(resizeWindow(w(["MO"], "06:00", 30), -30).durationMin).toBe(15);
    expect(resizeWindow(w(["MO"], "06:00", 7 * 1440 - 10), 15).durationMin).toBe(7 * 1440);
  });

  it("copying a day gives the targets its windows in place of their own", () => {
    const windows = [w(["MO"], "06:00", 60), w(["TU", "WE"], "08:00", 60), w(["WE"], "20:00", 60)];
    expect(copyDay(windows, "MO", ["WE", "MO"])).toEqual([w(["MO", "WE"], "06:00", 60), w(["TU"], "08:00", 60)]);
  });

  it("removing a window from one day keeps it on its others; from its last day removes it", () => {
    const plan = { windows: [w(["MO", "TU"], "06:00", 60)] } as PlanInput;
    const once = planReducer(plan, { type: "removeDay", index: 0, day: "MO" });
    expect(once.windows).toEqual([w(["TU"], "06:00", 60)]);
    expect(planReducer(once, { type: "removeDay", index: 0, day: "TU" }).windows).toEqual([]);
  });

  it("an edit keeps the stored window's id", () => {
    const plan = { windows: [{ ...w(["MO"], "06:00", 60), id: "a" }] } as unknown as PlanInput;
    expect(planReducer(plan, { type: "update", index: 0, window: w(["TU"], "07:00", 30) }).windows[0]).toMatchObject({ id: "a", days: ["TU"] });
  });
});

describe("clock-change days", () => {
  // IANA tz database, Europe/London (EU rule, Directive 2000/84/EC): forward on the last
  // Sunday of March, back on the last Sunday of October, at 01:00 UTC.
  it("finds the 23- and 25-hour days of 2027 in Europe/London, and none in UTC", () => {
    expect(clockChangeDays("Europe/London", new Date("2027-03-25T00:00:00Z"), new Date("2027-04-01T00:00:00Z"))).toEqual([{ date: "2027-03-28", hours: 23 }]);
    expect(clockChangeDays("Europe/London", new Date("2027-10-28T00:00:00Z"), new Date("2027-11-04T00:00:00Z"))).toEqual([{ date: "2027-10-31", hours: 25 }]);
    expect(clockChangeDays("UTC", new Date("2027-03-25T00:00:00Z"), new Date("2027-04-01T00:00:00Z"))).toEqual([]);
  });
});
