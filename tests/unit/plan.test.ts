import { describe, expect, it } from "vitest";
import { inForceAt, planSegments, type PlanInput } from "@/lib/control/plan";
import type { Schedule } from "@/lib/schedule";

const nights: Schedule = {
  id: "s1",
  validFrom: null,
  validUntil: null,
  skipDays: [],
  windows: [{ id: "w-night", recurrence: "FREQ=DAILY", startsAt: "18:00", durationMin: 14 * 60, mode: "band", lowC: 8, highC: 10 }],
};

const base: PlanInput = { schedules: [nights], timeZone: "Europe/London", outsideWindows: "frost", frostLowC: 3, frostHighC: 5, overrides: [] };
const at = (iso: string) => new Date(iso);

describe("inForceAt", () => {
  it("gives the window in force, when it closes and the default that follows", () => {
    const now = inForceAt(base, at("2026-12-03T20:00:00Z"));
    expect(now.rule).toEqual({ kind: "window", scheduleId: "s1", windowId: "w-night", mode: "band", lowC: 8, highC: 10 });
    expect(now.until).toEqual(at("2026-12-04T08:00:00Z"));
    expect(now.next).toEqual({ kind: "frost", lowC: 3, highC: 5 });
  });

  it("outside windows: the frost band until the window opens, or plain off", () => {
    const frost = inForceAt(base, at("2026-12-03T12:00:00Z"));
    expect(frost).toMatchObject({ rule: { kind: "frost", lowC: 3, highC: 5 }, until: at("2026-12-03T18:00:00Z") });
    expect(inForceAt({ ...base, outsideWindows: "off" }, at("2026-12-03T12:00:00Z")).rule).toEqual({ kind: "off" });
  });

  it("keeps local time across the end of summer time (IANA rules: Europe/London leaves BST on 2026-10-25)", () => {
    // 18:00 BST on the 24th is 17:00 UTC; 18:00 GMT on the 25th is 18:00 UTC.
    expect(inForceAt(base, at("2026-10-24T12:00:00Z")).until).toEqual(at("2026-10-24T17:00:00Z"));
    expect(inForceAt(base, at("2026-10-25T12:00:00Z")).until).toEqual(at("2026-10-25T18:00:00Z"));
  });

  it("an override wins, ends at its end; the latest-started one wins as in the controller", () => {
    const overrides = [
      { id: "o1", on: true, startsAt: at("2026-12-03T11:00:00Z"), endsAt: at("2026-12-03T15:00:00Z"), untilNextChange: false },
      { id: "o2", on: false, startsAt: at("2026-12-03T11:30:00Z"), endsAt: at("2026-12-03T12:30:00Z"), untilNextChange: false },
    ];
    const now = inForceAt({ ...base, overrides }, at("2026-12-03T12:00:00Z"));
    expect(now).toEqual({ rule: { kind: "override", overrideId: "o2", on: false }, until: at("2026-12-03T12:30:00Z"), next: { kind: "override", overrideId: "o1", on: true } });
  });

  it("an override until the next schedule change ends when the window opens", () => {
    const overrides = [{ id: "o", on: true, startsAt: at("2026-12-03T12:00:00Z"), endsAt: null, untilNextChange: true }];
    const now = inForceAt({ ...base, overrides }, at("2026-12-03T13:00:00Z"));
    expect(now.until).toEqual(at("2026-12-03T18:00:00Z"));
    expect(now.next).toMatchObject({ kind: "window", windowId: "w-night" });
  });

  it("a plug with no windows keeps its default for good", () => {
    expect(inForceAt({ ...base, schedules: [] }, at("2026-12-03T12:00:00Z"))).toEqual({ rule: { kind: "frost", lowC: 3, highC: 5 }, until: null, next: null });
  });
});

describe("planSegments", () => {
  it("covers the range with touching segments, merging a window's back-to-back occurrences", () => {
    const allDay: Schedule = { ...nights, windows: [{ ...nights.windows[0]!, id: "w-day", startsAt: "00:00", durationMin: 24 * 60 }] };
    const segments = planSegments({ ...base, schedules: [allDay] }, at("2026-12-03T12:00:00Z"), at("2026-12-06T12:00:00Z"));
    expect(segments).toHaveLength(1);
    expect(segments[0]).toMatchObject({ from: at("2026-12-03T12:00:00Z"), until: at("2026-12-06T12:00:00Z") });
  });

  it("alternates window and default over two days", () => {
    const segments = planSegments(base, at("2026-12-03T12:00:00Z"), at("2026-12-05T12:00:00Z"));
    expect(segments.map((s) => [s.from.toISOString(), s.rule.kind])).toEqual([
      ["2026-12-03T12:00:00.000Z", "frost"],
      ["2026-12-03T18:00:00.000Z", "window"],
      ["2026-12-04T08:00:00.000Z", "frost"],
      ["2026-12-04T18:00:00.000Z", "window"],
      ["2026-12-05T08:00:00.000Z", "frost"],
    ]);
    for (let i = 1; i < segments.length; i++) expect(segments[i]!.from).toEqual(segments[i - 1]!.until);
    expect(segments.at(-1)!.until).toEqual(at("2026-12-05T12:00:00Z"));
  });
});
