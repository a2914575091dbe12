import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { overrideEnd, overrideStopsAt } from "@/lib/override-end";
import { overrideSchema } from "@/lib/schemas/override";

const now = new Date("2026-03-28T22:00:00Z");

function refusal(fn: () => unknown): AppError {
  try {
    fn();
  } catch (error) {
    if (error instanceof AppError) return error;
    throw error;
  }
  throw new Error("expected a refusal");
}

describe("overrideEnd", () => {
  it("fixed durations end that long after now", () => {
    expect(overrideEnd({ duration: "30m" }, now, "Europe/London", null).endsAt!.toISOString()).toBe("2026-03-28T22:30:00.000Z");
    expect(overrideEnd({ duration: "3h" }, now, "Europe/London", null).endsAt!.toISOString()).toBe("2026-03-29T01:00:00.000Z");
  });

  it("a chosen time is read in the site's zone, across the spring-forward night", () => {
    // Europe/London moves from GMT to BST at 01:00 UTC on 29 March 2026 (EU summer-time rule, Directive 2000/84/EC: last Sunday of March).
    expect(overrideEnd({ duration: "until", until: "2026-03-29T09:00" }, now, "Europe/London", null).endsAt!.toISOString()).toBe(
      "2026-03-29T08:00:00.000Z",
    );
    // Sydney keeps daylight time (UTC+11) until the first Sunday of April (NSW Standard Time Act 1987).
    expect(overrideEnd({ duration: "until", until: "2026-03-29T10:00" }, now, "Australia/Sydney", null).endsAt!.toISOString()).toBe(
      "2026-03-28T23:00:00.000Z",
    );
  });

  it("until the next change keeps no end and needs a change to come", () => {
    expect(overrideEnd({ duration: "next_change" }, now, "UTC", new Date("2026-03-29T06:00:00Z"))).toEqual({ endsAt: null, untilNextChange: true });
    expect(refusal(() => overrideEnd({ duration: "next_change" }, now, "UTC", null)).fields).toHaveProperty("duration");
  });

  it("refuses a time in the past, within the minute, or more than 7 days ahead", () => {
    expect(refusal(() => overrideEnd({ duration: "until", until: "2026-03-28T21:00" }, now, "UTC", null)).message).toMatch(/at least a minute/);
    expect(refusal(() => overrideEnd({ duration: "until", until: "2026-03-28T22:00" }, now, "UTC", null)).message).toMatch(/at least a minute/);
    expect(refusal(() => overrideEnd({ duration: "until", until: "2026-04-05T00:00" }, now, "UTC", null)).message).toMatch(/within 7 days/);
    expect(overrideEnd({ duration: "until", until: "2026-04-04T21:59" }, now, "UTC", null).endsAt).not.toBeNull();
  });
});

describe("overrideStopsAt", () => {
  const end = new Date("2026-03-29T06:00:00Z");
  it("is the end, or the earlier cancellation", () => {
    expect(overrideStopsAt({ cancelledAt: null }, end)).toEqual(end);
    expect(overrideStopsAt({ cancelledAt: null }, null)).toBeNull();
    expect(overrideStopsAt({ cancelledAt: now }, end)).toEqual(now);
    expect(overrideStopsAt({ cancelledAt: now }, null)).toEqual(now);
    expect(overrideStopsAt({ cancelledAt: end }, now)).toEqual(now);
  });
});

describe("overrideSchema", () => {
  it("trims the reason and refuses impossible dates", () => {
    expect(overrideSchema.parse({ on: true, duration: "1h", reason: "  frost  " }).reason).toBe("frost");
    expect(overrideSchema.safeParse({ on: true, duration: "until", until: "2026-02-30T25:00" }).success).toBe(false);
  });
});
