// Properties of activeWindow / nextChange over random schedules and instants, in zones
// with DST changes in either hemisphere. Start times are biased towards 00:00–03:59,
// where the changes fall.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  HORIZON_MS,
  MAX_DURATION_MIN,
  type Schedule,
  type ScheduleWindow,
  activeAt,
  activeWindow,
  compileSchedule,
  nextChange,
} from "@/lib/schedule";

const ZONES = ["Europe/London", "Australia/Sydney", "America/New_York", "Pacific/Auckland", "Asia/Kolkata"];
const DAY = 86_400_000;
const YEAR_START = Date.parse("2026-01-01T00:00:00Z");
const WEEKDAYS = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"];
const pad = (n: number) => String(n).padStart(2, "0");
const dateOf = (dayOfYear: number) => new Date(YEAR_START + dayOfYear * DAY).toISOString().slice(0, 10);

const recurrence = fc.oneof(
  fc.constant("FREQ=DAILY"),
  fc.subarray(WEEKDAYS, { minLength: 1 }).map((days) => `FREQ=WEEKLY;BYDAY=${days.join(",")}`),
);
const startsAt = fc
  .tuple(fc.oneof(fc.integer({ min: 0, max: 3 }), fc.integer({ min: 0, max: 23 })), fc.constantFrom(0, 15, 30, 59))
  .map(([h, m]) => `${pad(h)}:${pad(m)}:00`);
const durationMin = fc.oneof(
  fc.integer({ min: 1, max: 180 }),
  fc.integer({ min: 1, max: 1440 }),
  fc.integer({ min: 1, max: MAX_DURATION_MIN }),
);
const window = fc
  .record({ recurrence, startsAt, durationMin })
  .map((w): Omit<ScheduleWindow, "id"> => ({ mode: "on", lowC: null, highC: null, ...w }));
const scheduleArb = fc
  .record({
    windows: fc.array(window, { minLength: 0, maxLength: 4 }),
    season: fc.option(fc.tuple(fc.integer({ min: 0, max: 360 }), fc.integer({ min: 0, max: 120 }))),
    skip: fc.array(fc.integer({ min: 0, max: 364 }), { maxLength: 8 }),
  })
  .map(
    ({ windows, season, skip }): Schedule => ({
      id: "s",
      windows: windows.map((w, i) => ({ ...w, id: `w${i}` })),
      validFrom: season ? dateOf(season[0]) : null,
      validUntil: season ? dateOf(season[0] + season[1]) : null,
      skipDays: [...new Set(skip.map(dateOf))],
    }),
  );
const instant = fc.integer({ min: 0, max: 365 * DAY - 1 }).map((ms) => YEAR_START + ms);

function key(schedules: Schedule, zone: string, ms: number): string {
  const a = activeWindow(schedules, zone, new Date(ms));
  return a ? `${a.scheduleId}/${a.window.id}@${a.opensAt.getTime()}-${a.closesAt.getTime()}` : "none";
}

describe("nextChange and activeWindow agree", () => {
  it("nextChange is later, nothing changes before it, something changes at it", () => {
    fc.assert(
      fc.property(scheduleArb, fc.constantFrom(...ZONES), instant, fc.array(fc.double({ min: 0, max: 1, noNaN: true })), (s, zone, at, fractions) => {
        const next = nextChange(s, zone, new Date(at));
        const here = key(s, zone, at);
        if (next === null) {
          // Nothing ever changes: the state holds for (at least) the next season's worth of samples.
          for (const f of fractions) expect(key(s, zone, at + Math.floor(f * 400 * DAY))).toBe(here);
          return;
        }
        const n = next.getTime();
        expect(n).toBeGreaterThan(at);
        for (const f of [...fractions, 0.5]) expect(key(s, zone, at + Math.floor(f * (n - at - 1)))).toBe(here);
        expect(key(s, zone, n - 1)).toBe(here);
        expect(key(s, zone, n)).not.toBe(here);
      }),
      { numRuns: 300 },
    );
  });

  it("the answer does not depend on where the compiled horizon starts", () => {
    fc.assert(
      fc.property(scheduleArb, fc.constantFrom(...ZONES), instant, fc.integer({ min: 0, max: HORIZON_MS - 1 }), (s, zone, at, back) => {
        const early = activeAt(compileSchedule(s, zone, at - back), at);
        const expected = activeWindow(s, zone, new Date(at));
        expect(early && [early.window.id, early.opensMs, early.closesMs]).toEqual(
          expected && [expected.window.id, expected.opensAt.getTime(), expected.closesAt.getTime()],
        );
      }),
      { numRuns: 300 },
    );
  });
});
