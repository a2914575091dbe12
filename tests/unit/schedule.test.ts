// activeWindow / nextChange tables. Most cases are in Europe/London in January, when
// local time is GMT = UTC+0, so local and UTC clock readings agree; 2026-01-05 is a Monday.
import { describe, expect, it } from "vitest";
import {
  HORIZON_MS,
  type Schedule,
  type ScheduleWindow,
  activeAt,
  activeWindow,
  compileSchedule,
  covers,
  nextChange,
  nextChangeAt,
  validateWindow,
} from "@/lib/schedule";

const LONDON = "Europe/London";

function win(id: string, recurrence: string, startsAt: string, durationMin: number, mode: ScheduleWindow["mode"] = "on"): ScheduleWindow {
  return { id, recurrence, startsAt, durationMin, mode, lowC: mode === "band" ? 5 : null, highC: mode === "band" ? 7 : null };
}

function schedule(windows: ScheduleWindow[], extra: Partial<Schedule> = {}): Schedule {
  return { id: "s", validFrom: null, validUntil: null, skipDays: [], windows, ...extra };
}

const at = (iso: string) => new Date(iso);
/** "window id@opening instant", or "none". */
function activeId(s: Schedule | Schedule[], iso: string, zone = LONDON): string {
  const a = activeWindow(s, zone, at(iso));
  return a ? `${a.window.id}@${a.opensAt.toISOString()}` : "none";
}
const next = (s: Schedule | Schedule[], iso: string, zone = LONDON) => nextChange(s, zone, at(iso))?.toISOString() ?? null;

describe("one weekly window (Mon, Wed, Fri 07:00 for 2 h)", () => {
  const s = schedule([win("am", "FREQ=WEEKLY;BYDAY=MO,WE,FR", "07:00:00", 120, "band")]);
  it.each([
    ["2026-01-05T06:59:59.999Z", "none", "2026-01-05T07:00:00.000Z"], // just before
    ["2026-01-05T07:00:00.000Z", "am@2026-01-05T07:00:00.000Z", "2026-01-05T09:00:00.000Z"], // opening instant: in force
    ["2026-01-05T08:00:00.000Z", "am@2026-01-05T07:00:00.000Z", "2026-01-05T09:00:00.000Z"], // inside
    ["2026-01-05T08:59:59.999Z", "am@2026-01-05T07:00:00.000Z", "2026-01-05T09:00:00.000Z"],
    ["2026-01-05T09:00:00.000Z", "none", "2026-01-07T07:00:00.000Z"], // closing instant: not in force
    ["2026-01-06T12:00:00.000Z", "none", "2026-01-07T07:00:00.000Z"], // a day without the window
    ["2026-01-09T09:00:00.000Z", "none", "2026-01-12T07:00:00.000Z"], // over the weekend
  ])("at %s: %s, next change %s", (when, active, change) => {
    expect(activeId(s, when)).toBe(active);
    expect(next(s, when)).toBe(change);
  });

  it("returns the window with its real opening and closing instants", () => {
    expect(activeWindow(s, LONDON, at("2026-01-05T08:00:00Z"))).toEqual({
      scheduleId: "s",
      window: s.windows[0],
      opensAt: at("2026-01-05T07:00:00Z"),
      closesAt: at("2026-01-05T09:00:00Z"),
    });
  });

  it("uses the site's zone: 07:00 in Pacific/Auckland in January is NZDT, UTC+13", () => {
    // IANA Pacific/Auckland: NZDT (UTC+13) from late September to early April.
    // Mon 2026-01-05 07:00 NZDT = Sun 2026-01-04 18:00 UTC.
    expect(activeId(s, "2026-01-04T18:00:00Z", "Pacific/Auckland")).toBe("am@2026-01-04T18:00:00.000Z");
    expect(next(s, "2026-01-04T12:00:00Z", "Pacific/Auckland")).toBe("2026-01-04T18:00:00.000Z");
  });
});

describe("windows that span midnight", () => {
  const nightly = schedule([win("night", "FREQ=DAILY", "22:00:00", 480)]);
  it("the window that opened yesterday is in force at 01:00 today", () => {
    expect(activeId(nightly, "2026-01-06T01:00:00Z")).toBe("night@2026-01-05T22:00:00.000Z");
    expect(next(nightly, "2026-01-06T01:00:00Z")).toBe("2026-01-06T06:00:00.000Z");
    expect(activeId(nightly, "2026-01-06T06:00:00Z")).toBe("none");
    expect(next(nightly, "2026-01-06T06:00:00Z")).toBe("2026-01-06T22:00:00.000Z");
  });

  it("a Friday-night window is in force early on Saturday, not on Sunday", () => {
    const friday = schedule([win("fri", "FREQ=WEEKLY;BYDAY=FR", "22:00:00", 480)]);
    expect(activeId(friday, "2026-01-10T01:00:00Z")).toBe("fri@2026-01-09T22:00:00.000Z");
    expect(activeId(friday, "2026-01-11T01:00:00Z")).toBe("none");
  });

  it("a week-long window is always in force and changes when the next one opens", () => {
    const always = schedule([win("week", "FREQ=WEEKLY;BYDAY=MO", "00:00:00", 7 * 1440)]);
    expect(activeId(always, "2026-01-11T23:59:59Z")).toBe("week@2026-01-05T00:00:00.000Z");
    expect(next(always, "2026-01-08T12:00:00Z")).toBe("2026-01-12T00:00:00.000Z");
    expect(activeId(always, "2026-01-12T00:00:00Z")).toBe("week@2026-01-12T00:00:00.000Z");
  });

  it("a daily 24-hour window changes occurrence at each start, without a gap", () => {
    const allDay = schedule([win("day", "FREQ=DAILY", "00:00:00", 1440)]);
    expect(next(allDay, "2026-01-05T12:00:00Z")).toBe("2026-01-06T00:00:00.000Z");
    expect(activeId(allDay, "2026-01-06T00:00:00Z")).toBe("day@2026-01-06T00:00:00.000Z");
  });
});

describe("season", () => {
  // Windows open on local dates 2026-01-07 (Wed) to 2026-01-09 (Fri).
  const s = schedule([win("night", "FREQ=DAILY", "22:00:00", 480)], { validFrom: "2026-01-07", validUntil: "2026-01-09" });
  it.each([
    ["2026-01-07T01:00:00Z", "none"], // opened on 01-06, before the season: never opened
    ["2026-01-07T21:59:59Z", "none"],
    ["2026-01-07T22:00:00Z", "night@2026-01-07T22:00:00.000Z"], // first day
    ["2026-01-10T01:00:00Z", "night@2026-01-09T22:00:00.000Z"], // opened on the last day: runs to its close
    ["2026-01-10T06:00:00Z", "none"],
    ["2026-01-10T22:00:00Z", "none"], // after the season
  ])("at %s: %s", (when, active) => {
    expect(activeId(s, when)).toBe(active);
  });

  it("the next change before the season is its first opening; after it there is none", () => {
    expect(next(s, "2026-01-01T00:00:00Z")).toBe("2026-01-07T22:00:00.000Z");
    expect(next(s, "2026-01-10T06:00:00Z")).toBeNull();
    expect(next(s, "2027-06-01T00:00:00Z")).toBeNull();
  });

  it("finds a season that starts months later (beyond the 8-day horizon)", () => {
    const spring = schedule([win("night", "FREQ=DAILY", "22:00:00", 480)], { validFrom: "2026-03-01", validUntil: null });
    // 2026-03-01 is still GMT (BST starts 03-29).
    expect(next(spring, "2026-01-01T00:00:00Z")).toBe("2026-03-01T22:00:00.000Z");
    // A window opening at the season's first instant.
    const midnight = schedule([win("m", "FREQ=DAILY", "00:00:00", 60)], { validFrom: "2026-03-01" });
    expect(next(midnight, "2026-01-01T00:00:00Z")).toBe("2026-03-01T00:00:00.000Z");
    // A Monday-only window in a season starting on a Sunday: first opening 2026-03-02.
    const monday = schedule([win("mo", "FREQ=WEEKLY;BYDAY=MO", "07:00:00", 60)], { validFrom: "2026-03-01" });
    expect(next(monday, "2026-02-20T00:00:00Z")).toBe("2026-03-02T07:00:00.000Z");
  });
});

describe("skip days", () => {
  const s = schedule([win("night", "FREQ=DAILY", "22:00:00", 480)], { skipDays: ["2026-01-07"] });
  it("no window opens on a skip day; the one opened the day before runs to its close", () => {
    expect(activeId(s, "2026-01-07T03:00:00Z")).toBe("night@2026-01-06T22:00:00.000Z");
    expect(activeId(s, "2026-01-07T23:00:00Z")).toBe("none");
    expect(activeId(s, "2026-01-08T01:00:00Z")).toBe("none");
    expect(next(s, "2026-01-07T06:00:00Z")).toBe("2026-01-08T22:00:00.000Z");
  });

  it("a fortnight of skip days (longer than the horizon) is searched past", () => {
    const days = Array.from({ length: 14 }, (_, i) => `2026-01-${String(7 + i).padStart(2, "0")}`);
    const holiday = schedule([win("night", "FREQ=DAILY", "22:00:00", 480)], { skipDays: days });
    expect(next(holiday, "2026-01-07T06:00:00Z")).toBe("2026-01-21T22:00:00.000Z");
  });
});

describe("overlapping and touching windows", () => {
  const frost = win("frost", "FREQ=DAILY", "00:00:00", 1440, "band");
  const boost = win("boost", "FREQ=DAILY", "18:00:00", 120, "band");

  it("the window that opened latest is in force; the interrupted one resumes", () => {
    const s = schedule([frost, boost]);
    expect(activeId(s, "2026-01-05T17:59:59Z")).toBe("frost@2026-01-05T00:00:00.000Z");
    expect(activeId(s, "2026-01-05T18:00:00Z")).toBe("boost@2026-01-05T18:00:00.000Z");
    expect(next(s, "2026-01-05T18:00:00Z")).toBe("2026-01-05T20:00:00.000Z");
    expect(activeId(s, "2026-01-05T20:00:00Z")).toBe("frost@2026-01-05T00:00:00.000Z");
    expect(next(s, "2026-01-05T20:00:00Z")).toBe("2026-01-06T00:00:00.000Z");
  });

  it("the order of the windows does not matter for different opening times", () => {
    expect(activeId(schedule([boost, frost]), "2026-01-05T19:00:00Z")).toBe("boost@2026-01-05T18:00:00.000Z");
  });

  it("same opening instant: the one that closes first, then the one listed first", () => {
    const short = win("short", "FREQ=DAILY", "07:00:00", 60);
    const long = win("long", "FREQ=DAILY", "07:00:00", 180);
    expect(activeId(schedule([long, short]), "2026-01-05T07:30:00Z")).toBe("short@2026-01-05T07:00:00.000Z");
    expect(activeId(schedule([long, short]), "2026-01-05T08:00:00Z")).toBe("long@2026-01-05T07:00:00.000Z");
    const twin = win("twin", "FREQ=DAILY", "07:00:00", 60);
    expect(activeId(schedule([twin, short]), "2026-01-05T07:30:00Z")).toBe("twin@2026-01-05T07:00:00.000Z");
    expect(activeId(schedule([short, twin]), "2026-01-05T07:30:00Z")).toBe("short@2026-01-05T07:00:00.000Z");
  });

  it("applies across the plug's schedules", () => {
    const day = schedule([win("day", "FREQ=DAILY", "06:00:00", 600)], { id: "winter" });
    const extra = schedule([win("lunch", "FREQ=WEEKLY;BYDAY=MO", "12:00:00", 60)], { id: "extra" });
    const a = activeWindow([day, extra], LONDON, at("2026-01-05T12:30:00Z"));
    expect(a?.scheduleId).toBe("extra");
    expect(activeWindow([day, extra], LONDON, at("2026-01-05T13:00:00Z"))?.scheduleId).toBe("winter");
  });

  it("windows that touch leave no gap", () => {
    const s = schedule([win("a", "FREQ=DAILY", "06:00:00", 120), win("b", "FREQ=DAILY", "08:00:00", 120)]);
    expect(activeId(s, "2026-01-05T07:59:59.999Z")).toBe("a@2026-01-05T06:00:00.000Z");
    expect(next(s, "2026-01-05T07:00:00Z")).toBe("2026-01-05T08:00:00.000Z");
    expect(activeId(s, "2026-01-05T08:00:00Z")).toBe("b@2026-01-05T08:00:00.000Z");
    expect(next(s, "2026-01-05T08:00:00Z")).toBe("2026-01-05T10:00:00.000Z");
  });
});

describe("nothing to do", () => {
  it("no schedules, or schedules without windows", () => {
    expect(activeWindow([], LONDON, at("2026-01-05T12:00:00Z"))).toBeNull();
    expect(nextChange([], LONDON, at("2026-01-05T12:00:00Z"))).toBeNull();
    expect(nextChange(schedule([]), LONDON, at("2026-01-05T12:00:00Z"))).toBeNull();
  });
});

describe("compiled fast path", () => {
  const s = schedule([win("am", "FREQ=WEEKLY;BYDAY=MO,WE,FR", "07:00:00", 120)]);
  const from = Date.parse("2026-01-05T00:00:00Z");
  const compiled = compileSchedule(s, LONDON, from);

  it("covers 8 days from the compile instant", () => {
    expect(compiled.until - compiled.from).toBe(HORIZON_MS);
    expect(HORIZON_MS).toBe(8 * 86_400_000);
    expect(covers(compiled, from)).toBe(true);
    expect(covers(compiled, from + HORIZON_MS)).toBe(false);
    expect(() => activeAt(compiled, from - 1)).toThrow(RangeError);
    expect(() => activeAt(compiled, from + HORIZON_MS)).toThrow(RangeError);
  });

  it("holds the occurrences of the horizon as sorted segments", () => {
    // Mon 5, Wed 7, Fri 9, Mon 12 at 07:00 GMT; 01-12 07:00 is within 8 days of 01-05 00:00.
    expect([...compiled.starts].map((t) => new Date(t).toISOString())).toEqual([
      "2026-01-05T07:00:00.000Z",
      "2026-01-07T07:00:00.000Z",
      "2026-01-09T07:00:00.000Z",
      "2026-01-12T07:00:00.000Z",
    ]);
    expect(compiled.ends[0]! - compiled.starts[0]!).toBe(2 * 3_600_000);
  });

  it("answers with the same object each time (nothing allocated per lookup)", () => {
    const t = Date.parse("2026-01-05T08:00:00Z");
    expect(activeAt(compiled, t)).toBe(activeAt(compiled, t + 1000));
    expect(activeAt(compiled, t)?.window.id).toBe("am");
  });

  it("reports no change past the horizon's end", () => {
    // Last opening 01-12 07:00 closes at 09:00, after `until` (01-13 00:00 is the end).
    expect(nextChangeAt(compiled, Date.parse("2026-01-12T08:00:00Z"))).toBe(Date.parse("2026-01-12T09:00:00Z"));
    const late = compileSchedule(s, LONDON, Date.parse("2026-01-05T10:00:00Z"), 3_600_000);
    expect(nextChangeAt(late, Date.parse("2026-01-05T10:00:00Z"))).toBeNull();
  });
});

describe("invalid input is refused, not guessed around", () => {
  const base = win("w", "FREQ=DAILY", "07:00:00", 60);
  it.each([
    [{ ...base, recurrence: "FREQ=MONTHLY" }, /FREQ/],
    [{ ...base, startsAt: "24:00:00" }, /time of day/],
    [{ ...base, startsAt: "7:00" }, /time of day/],
    [{ ...base, durationMin: 0 }, /duration/],
    [{ ...base, durationMin: 7 * 1440 + 1 }, /duration/],
    [{ ...base, durationMin: 1.5 }, /duration/],
  ])("window %j", (window, message) => {
    const check = validateWindow(window);
    expect(check.ok).toBe(false);
    expect(() => compileSchedule(schedule([window]), LONDON, 0)).toThrow(message);
  });

  it("accepts HH:MM and HH:MM:SS start times", () => {
    expect(validateWindow({ ...base, startsAt: "07:00" })).toEqual({ ok: true });
    expect(validateWindow({ ...base, startsAt: "23:59:59" })).toEqual({ ok: true });
  });

  it("refuses an unknown zone and malformed dates", () => {
    expect(() => activeWindow(schedule([base]), "Mars/Olympus_Mons", at("2026-01-05T00:00:00Z"))).toThrow(/time zone/);
    expect(() => activeWindow(schedule([base], { skipDays: ["2026-02-30"] }), LONDON, at("2026-01-05T00:00:00Z"))).toThrow(
      /not a date/,
    );
    expect(() => activeWindow(schedule([base], { validFrom: "05/01/2026" }), LONDON, at("2026-01-05T00:00:00Z"))).toThrow(
      /not a date/,
    );
  });
});
