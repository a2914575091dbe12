// The controller's per-plug schedule: it remembers its last answer until the next
// edge, so it must agree with a fresh lookup at every instant, in any order of asking.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { compilePlugSchedule } from "@/controller/plug-schedule";
import { activeAt, compileSchedule, type Schedule } from "@/lib/schedule";

const schedule: Schedule = {
  id: "s",
  validFrom: null,
  validUntil: null,
  skipDays: ["2026-03-31"],
  windows: [
    { id: "day", recurrence: "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR", startsAt: "06:30:00", durationMin: 13 * 60, mode: "band", lowC: 8, highC: 10 },
    { id: "boost", recurrence: "FREQ=DAILY", startsAt: "07:00:00", durationMin: 45, mode: "on", lowC: null, highC: null },
    { id: "night", recurrence: "FREQ=DAILY", startsAt: "01:30:00", durationMin: 90, mode: "band", lowC: 4, highC: 6 },
  ],
};
// The week of the spring change in London (last Sunday of March, IANA rules).
const start = Date.parse("2026-03-26T00:00:00Z");
const fresh = (ms: number) => {
  const occurrence = activeAt(compileSchedule(schedule, "Europe/London", ms), ms);
  return occurrence && { mode: occurrence.window.mode, lowC: occurrence.window.lowC, highC: occurrence.window.highC };
};

describe("a plug's compiled schedule", () => {
  it("gives the same window as a fresh lookup, minute by minute through a week", () => {
    const plug = compilePlugSchedule([schedule], "Europe/London");
    for (let ms = start; ms < start + 7 * 86_400_000; ms += 60_000) {
      const got = plug.activeAt(ms);
      expect(got && { ...got.window }, new Date(ms).toISOString()).toEqual(fresh(ms));
    }
  });

  it("gives the same window whatever order it is asked in", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 10 * 86_400_000 }), { minLength: 1, maxLength: 40 }), (offsets) => {
        const plug = compilePlugSchedule([schedule], "Europe/London");
        for (const offset of offsets) {
          const got = plug.activeAt(start + offset);
          expect(got && { ...got.window }).toEqual(fresh(start + offset));
        }
      }),
      { numRuns: 60 },
    );
  });

  it("shares one window object between plugs with the same rule", () => {
    const a = compilePlugSchedule([schedule], "Europe/London");
    const b = compilePlugSchedule([{ ...schedule, id: "t" }], "Europe/London");
    const at = Date.parse("2026-03-30T12:00:00Z");
    expect(a.activeAt(at)).not.toBeNull();
    expect(a.activeAt(at)).toBe(b.activeAt(at));
    expect(Object.isFrozen(a.activeAt(at)!.window)).toBe(true);
  });
});
