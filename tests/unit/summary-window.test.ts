// Which stretch a daily summary covers. Europe/London's spring-forward day, Sunday
// 29 March 2026, has 23 hours (IANA time zone database, EU rule).
import { describe, expect, it } from "vitest";
import { summaryWindowAt } from "@/lib/alerts/summary";

const iso = (w: ReturnType<typeof summaryWindowAt>) => w && { day: w.day, from: w.from.toISOString(), to: w.to.toISOString(), wholeDay: w.wholeDay };

describe("the daily summary's stretch", () => {
  it("is none without a summary time, and none before the time of the local day", () => {
    expect(summaryWindowAt(new Date("2026-12-03T09:00:00Z"), "Europe/London", null)).toBeNull();
    expect(summaryWindowAt(new Date("2026-12-03T06:59:59Z"), "Europe/London", "07:00")).toBeNull();
  });

  it("a morning time sends the whole of yesterday", () => {
    expect(iso(summaryWindowAt(new Date("2026-12-03T07:00:00Z"), "Europe/London", "07:00"))).toEqual({
      day: "2026-12-02",
      from: "2026-12-02T00:00:00.000Z",
      to: "2026-12-03T00:00:00.000Z",
      wholeDay: true,
    });
    // 11:59 is still morning.
    expect(summaryWindowAt(new Date("2026-12-03T12:00:00Z"), "Europe/London", "11:59")?.day).toBe("2026-12-02");
  });

  it("a time from noon on sends today up to the summary time", () => {
    expect(iso(summaryWindowAt(new Date("2026-12-03T18:30:00Z"), "Europe/London", "18:00"))).toEqual({
      day: "2026-12-03",
      from: "2026-12-03T00:00:00.000Z",
      to: "2026-12-03T18:00:00.000Z",
      wholeDay: false,
    });
    expect(summaryWindowAt(new Date("2026-12-03T12:00:00Z"), "Europe/London", "12:00")?.day).toBe("2026-12-03");
  });

  it("follows the site's zone and its short day", () => {
    // 07:00 Pacific is 15:00 UTC in December (PST, UTC−8).
    expect(summaryWindowAt(new Date("2026-12-03T14:59:00Z"), "America/Los_Angeles", "07:00")).toBeNull();
    expect(iso(summaryWindowAt(new Date("2026-12-03T15:00:00Z"), "America/Los_Angeles", "07:00"))?.from).toBe("2026-12-02T08:00:00.000Z");
    const shortDay = summaryWindowAt(new Date("2026-03-30T06:00:00Z"), "Europe/London", "07:00")!;
    expect(shortDay.day).toBe("2026-03-29");
    expect(shortDay.to.getTime() - shortDay.from.getTime()).toBe(23 * 3600_000);
  });

  it("refuses a summary time that is not one", () => {
    expect(() => summaryWindowAt(new Date(), "Europe/London", "7am")).toThrow(/not a time of day/);
  });
});
