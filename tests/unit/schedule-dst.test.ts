// Windows on the days the clocks change. Transition dates and offsets are from the IANA
// time-zone database (as Intl/ICU ships it), written out by hand below; no expected
// instant is computed with the code under test.
//
// Europe/London: GMT = UTC+0, BST = UTC+1. 2026-03-29 01:00 UTC: 01:00 GMT → 02:00 BST.
//                2026-10-25 01:00 UTC: 02:00 BST → 01:00 GMT.
// Australia/Sydney: AEST = UTC+10, AEDT = UTC+11. 2026-04-05 03:00 AEDT → 02:00 AEST
//                (2026-04-04 16:00 UTC). 2026-10-04 02:00 AEST → 03:00 AEDT (2026-10-03 16:00 UTC).
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { type Schedule, activeWindow, compileSchedule, nextChange, toInstant } from "@/lib/schedule";

const LONDON = "Europe/London";
const SYDNEY = "Australia/Sydney";
const HOUR = 3_600_000;

function daily(startsAt: string, durationMin: number): Schedule {
  return {
    id: "s",
    validFrom: null,
    validUntil: null,
    skipDays: [],
    windows: [{ id: "w", recurrence: "FREQ=DAILY", startsAt, durationMin, mode: "on", lowC: null, highC: null }],
  };
}

/** [opens, closes] in UTC of every occurrence that is open at some point in [from, until). */
function occurrences(schedule: Schedule, timeZone: string, from: string, until: string): string[][] {
  const start = Date.parse(from);
  const compiled = compileSchedule(schedule, timeZone, start, Date.parse(until) - start);
  return compiled.occurrences.map((o) => [new Date(o.opensMs).toISOString(), new Date(o.closesMs).toISOString()]);
}

const utc = (iso: string) => new Date(iso);

describe("wall-clock time to instant (IANA database through luxon/Intl)", () => {
  it.each([
    // Europe/London, spring forward: 01:00–01:59 local does not exist on 2026-03-29.
    [LONDON, "2026-03-29T00:59:00", "2026-03-29T00:59:00.000Z"], // GMT
    [LONDON, "2026-03-29T01:00:00", "2026-03-29T01:00:00.000Z"], // gap → 02:00 BST
    [LONDON, "2026-03-29T01:30:00", "2026-03-29T01:00:00.000Z"], // gap → 02:00 BST
    [LONDON, "2026-03-29T02:00:00", "2026-03-29T01:00:00.000Z"], // 02:00 BST
    [LONDON, "2026-03-29T03:00:00", "2026-03-29T02:00:00.000Z"], // BST
    // Europe/London, fall back: 01:00–01:59 local happens twice on 2026-10-25.
    [LONDON, "2026-10-25T00:59:00", "2026-10-24T23:59:00.000Z"], // BST
    [LONDON, "2026-10-25T01:00:00", "2026-10-25T00:00:00.000Z"], // first: BST (not 01:00 GMT = 01:00Z)
    [LONDON, "2026-10-25T01:30:00", "2026-10-25T00:30:00.000Z"], // first: BST (not 01:30Z)
    [LONDON, "2026-10-25T02:00:00", "2026-10-25T02:00:00.000Z"], // GMT
    // Australia/Sydney, DST ends: 02:00–02:59 local happens twice on 2026-04-05.
    [SYDNEY, "2026-04-05T01:59:00", "2026-04-04T14:59:00.000Z"], // AEDT
    [SYDNEY, "2026-04-05T02:30:00", "2026-04-04T15:30:00.000Z"], // first: AEDT (not 16:30Z)
    [SYDNEY, "2026-04-05T03:00:00", "2026-04-04T17:00:00.000Z"], // AEST
    // Australia/Sydney, DST starts: 02:00–02:59 local does not exist on 2026-10-04.
    [SYDNEY, "2026-10-04T01:59:00", "2026-10-03T15:59:00.000Z"], // AEST
    [SYDNEY, "2026-10-04T02:30:00", "2026-10-03T16:00:00.000Z"], // gap → 03:00 AEDT
    [SYDNEY, "2026-10-04T03:00:00", "2026-10-03T16:00:00.000Z"], // AEDT
  ])("%s %s → %s", (zone, local, expected) => {
    expect(toInstant(local, zone).toISOString()).toBe(expected);
  });

  it("differs from luxon's own resolution on purpose", () => {
    // What DateTime.fromObject does (luxon 3.7): a gap time moves forward by the gap's
    // length, and a repeated time takes the later offset. Cloche's rules are above.
    const gap = DateTime.fromObject({ year: 2026, month: 3, day: 29, hour: 1, minute: 30 }, { zone: LONDON });
    expect(gap.toUTC().toISO()).toBe("2026-03-29T01:30:00.000Z"); // 02:30 BST
    const twice = DateTime.fromObject({ year: 2026, month: 10, day: 25, hour: 1, minute: 30 }, { zone: LONDON });
    expect(twice.toUTC().toISO()).toBe("2026-10-25T01:30:00.000Z"); // the second 01:30 (GMT)
  });
});

describe("Europe/London, spring forward on 2026-03-29 (a 23-hour day)", () => {
  it("a whole-day window lasts 23 hours", () => {
    // 00:00 GMT = 00:00Z; next local midnight 00:00 BST on 03-30 = 03-29 23:00Z.
    expect(occurrences(daily("00:00:00", 1440), LONDON, "2026-03-29T00:00:00Z", "2026-03-29T12:00:00Z")).toEqual([
      ["2026-03-29T00:00:00.000Z", "2026-03-29T23:00:00.000Z"],
    ]);
  });

  it("lights 06:00 → 20:00 keep their local times on either side of the change", () => {
    // 03-28: GMT, 06:00Z → 20:00Z. 03-29: BST, 05:00Z → 19:00Z.
    expect(occurrences(daily("06:00:00", 840), LONDON, "2026-03-28T00:00:00Z", "2026-03-29T23:00:00Z")).toEqual([
      ["2026-03-28T06:00:00.000Z", "2026-03-28T20:00:00.000Z"],
      ["2026-03-29T05:00:00.000Z", "2026-03-29T19:00:00.000Z"],
    ]);
  });

  it("a window across the change is an hour shorter in elapsed time", () => {
    // 00:30 GMT = 00:30Z → 02:30 BST = 01:30Z: 60 minutes instead of 120.
    const [o] = occurrences(daily("00:30:00", 120), LONDON, "2026-03-29T00:00:00Z", "2026-03-29T01:00:00Z");
    expect(o).toEqual(["2026-03-29T00:30:00.000Z", "2026-03-29T01:30:00.000Z"]);
  });

  it("a window opening at a time that does not exist opens when the gap ends", () => {
    // 01:30 does not exist; opens 02:00 BST = 01:00Z, closes 02:30 BST = 01:30Z.
    const s = daily("01:30:00", 60);
    expect(activeWindow(s, LONDON, utc("2026-03-29T00:59:59Z"))).toBeNull();
    expect(activeWindow(s, LONDON, utc("2026-03-29T01:00:00Z"))).toMatchObject({
      opensAt: utc("2026-03-29T01:00:00Z"),
      closesAt: utc("2026-03-29T01:30:00Z"),
    });
    expect(nextChange(s, LONDON, utc("2026-03-29T00:00:00Z"))).toEqual(utc("2026-03-29T01:00:00Z"));
  });

  it("a window lying wholly inside the gap does not happen that day", () => {
    // 01:00 + 30 min: both ends map to 01:00Z. Next opening 03-30 01:00 BST = 00:00Z.
    const s = daily("01:00:00", 30);
    expect(activeWindow(s, LONDON, utc("2026-03-29T01:00:00Z"))).toBeNull();
    expect(nextChange(s, LONDON, utc("2026-03-28T02:00:00Z"))).toEqual(utc("2026-03-30T00:00:00Z"));
  });

  it("a window that spans midnight into the change day closes at its local time", () => {
    // 03-28 22:00 GMT = 22:00Z → 03-29 06:00 BST = 05:00Z: 7 hours elapsed.
    const s = daily("22:00:00", 480);
    expect(activeWindow(s, LONDON, utc("2026-03-29T04:59:00Z"))?.opensAt).toEqual(utc("2026-03-28T22:00:00Z"));
    expect(activeWindow(s, LONDON, utc("2026-03-29T05:00:00Z"))).toBeNull();
  });
});

describe("Europe/London, fall back on 2026-10-25 (a 25-hour day)", () => {
  it("a whole-day window lasts 25 hours", () => {
    // 00:00 BST = 10-24 23:00Z; next local midnight 00:00 GMT on 10-26 = 10-26 00:00Z.
    expect(occurrences(daily("00:00:00", 1440), LONDON, "2026-10-25T00:00:00Z", "2026-10-25T12:00:00Z")).toEqual([
      ["2026-10-24T23:00:00.000Z", "2026-10-26T00:00:00.000Z"],
    ]);
  });

  it("a window across the change is an hour longer in elapsed time", () => {
    // 00:30 BST = 10-24 23:30Z → 02:30 GMT = 02:30Z: 3 hours instead of 2.
    const [o] = occurrences(daily("00:30:00", 120), LONDON, "2026-10-25T00:00:00Z", "2026-10-25T01:00:00Z");
    expect(o).toEqual(["2026-10-24T23:30:00.000Z", "2026-10-25T02:30:00.000Z"]);
  });

  it("a window at a time that happens twice opens once, at the first", () => {
    // 01:15 BST = 00:15Z → 01:45 BST = 00:45Z. The second 01:15 (GMT, 01:15Z) opens nothing.
    const s = daily("01:15:00", 30);
    expect(activeWindow(s, LONDON, utc("2026-10-25T00:15:00Z"))?.closesAt).toEqual(utc("2026-10-25T00:45:00Z"));
    expect(activeWindow(s, LONDON, utc("2026-10-25T01:15:00Z"))).toBeNull();
    // Next opening: 10-26 01:15 GMT = 01:15Z.
    expect(nextChange(s, LONDON, utc("2026-10-25T00:45:00Z"))).toEqual(utc("2026-10-26T01:15:00Z"));
  });

  it("a window opening in the repeated hour and closing after it spans both", () => {
    // 01:30 BST = 00:30Z → 02:30 GMT = 02:30Z: 2 hours elapsed for a 60-minute window.
    const [o] = occurrences(daily("01:30:00", 60), LONDON, "2026-10-25T00:00:00Z", "2026-10-25T01:00:00Z");
    expect(o).toEqual(["2026-10-25T00:30:00.000Z", "2026-10-25T02:30:00.000Z"]);
  });
});

describe("Australia/Sydney (southern hemisphere)", () => {
  it("DST ends on 2026-04-05: a 25-hour day, and a window across the change", () => {
    // 00:00 AEDT = 04-04 13:00Z; 00:00 AEST on 04-06 = 04-05 14:00Z.
    expect(occurrences(daily("00:00:00", 1440), SYDNEY, "2026-04-04T13:00:00Z", "2026-04-04T14:00:00Z")).toEqual([
      ["2026-04-04T13:00:00.000Z", "2026-04-05T14:00:00.000Z"],
    ]);
    // 04-04 22:00 AEDT = 11:00Z → 04-05 06:00 AEST = 04-04 20:00Z: 9 hours for an 8-hour window.
    const s = daily("22:00:00", 480);
    expect(activeWindow(s, SYDNEY, utc("2026-04-04T19:59:59Z"))).toMatchObject({
      opensAt: utc("2026-04-04T11:00:00Z"),
      closesAt: utc("2026-04-04T20:00:00Z"),
    });
  });

  it("DST ends: a start time that happens twice opens at the first (AEDT)", () => {
    // 02:30 AEDT = 04-04 15:30Z (the second 02:30, AEST, would be 16:30Z).
    expect(nextChange(daily("02:30:00", 10), SYDNEY, utc("2026-04-04T15:00:00Z"))).toEqual(utc("2026-04-04T15:30:00Z"));
  });

  it("DST starts on 2026-10-04: a 23-hour day, a missing start, a window across the change", () => {
    // 00:00 AEST = 10-03 14:00Z; 00:00 AEDT on 10-05 = 10-04 13:00Z.
    expect(occurrences(daily("00:00:00", 1440), SYDNEY, "2026-10-03T14:00:00Z", "2026-10-03T15:00:00Z")).toEqual([
      ["2026-10-03T14:00:00.000Z", "2026-10-04T13:00:00.000Z"],
    ]);
    // 02:30 does not exist: opens at 03:00 AEDT = 10-03 16:00Z, closes 03:30 AEDT = 16:30Z.
    expect(occurrences(daily("02:30:00", 60), SYDNEY, "2026-10-03T15:00:00Z", "2026-10-03T16:10:00Z")).toEqual([
      ["2026-10-03T16:00:00.000Z", "2026-10-03T16:30:00.000Z"],
    ]);
    // 10-03 22:00 AEST = 12:00Z → 10-04 06:00 AEDT = 10-03 19:00Z: 7 hours for an 8-hour window.
    const window = activeWindow(daily("22:00:00", 480), SYDNEY, utc("2026-10-03T18:00:00Z"));
    expect(window && (window.closesAt.getTime() - window.opensAt.getTime()) / HOUR).toBe(7);
  });
});

// Found by the property test (seed 2025525952): a window lasting days that closes inside
// the spring-forward gap closed an hour off when looked up with a short horizon.
// Europe/London springs forward at 01:00 UTC on 2026-03-29 (IANA rules, EU last-Sunday-of-March).
describe("a long window closing in the spring-forward gap", () => {
  it("closes at the instant the clocks jumped, whatever the horizon", () => {
    const schedule = {
      id: "s",
      validFrom: null,
      validUntil: null,
      skipDays: [],
      windows: [{ id: "w0", mode: "on" as const, lowC: null, highC: null, recurrence: "FREQ=DAILY", startsAt: "00:00:00", durationMin: 4381 }],
    };
    const at = new Date("2026-03-26T00:00:00Z");
    // 00:00 GMT on 26 March + 4381 min = 01:01 local on 29 March, which does not exist.
    expect(activeWindow(schedule, "Europe/London", at)?.closesAt.toISOString()).toBe("2026-03-29T01:00:00.000Z");
  });
});
