import { describe, expect, it } from "vitest";
import { expandRecurrence, toInstant, validateRecurrence } from "@/lib/schedule";

const NY = "America/New_York";

describe("recurrence expansion against RFC 5545 §3.8.5.3 (DTSTART;TZID=America/New_York:19970902T090000)", () => {
  it("weekly on Tuesday and Thursday for five weeks", () => {
    // RFC 5545 §3.8.5.3: RRULE:FREQ=WEEKLY;COUNT=10;WKST=SU;BYDAY=TU,TH
    // ==> (1997 9:00 AM EDT) September 2,4,9,11,16,18,23,25,30; October 2
    const days = ["09-02", "09-04", "09-09", "09-11", "09-16", "09-18", "09-23", "09-25", "09-30", "10-02"];
    expect(expandRecurrence("FREQ=WEEKLY;COUNT=10;WKST=SU;BYDAY=TU,TH", "1997-09-02T09:00:00")).toEqual(
      days.map((d) => `1997-${d}T09:00:00`),
    );
  });

  it("every other week on Tuesday and Thursday, for 8 occurrences", () => {
    // RFC 5545 §3.8.5.3: RRULE:FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH
    // ==> (1997 9:00 AM EDT) September 2,4,16,18,30; October 2,14,16
    const days = ["09-02", "09-04", "09-16", "09-18", "09-30", "10-02", "10-14", "10-16"];
    expect(expandRecurrence("FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH", "1997-09-02T09:00:00")).toEqual(
      days.map((d) => `1997-${d}T09:00:00`),
    );
  });

  it("keeps 09:00 local across the end of daylight saving time, so the UTC hour moves", () => {
    // RFC 5545 §3.8.5.3, "Weekly for 10 occurrences": RRULE:FREQ=WEEKLY;COUNT=10
    // ==> (1997 9:00 AM EDT) September 2,9,16,23,30; October 7,14,21
    //     (1997 9:00 AM EST) October 28; November 4
    // US rules of 1997 (IANA America/New_York): EDT (UTC-4) ended on Sunday 1997-10-26,
    // so 09:00 EDT = 13:00 UTC and 09:00 EST (UTC-5) = 14:00 UTC.
    const local = expandRecurrence("FREQ=WEEKLY;COUNT=10", "1997-09-02T09:00:00");
    expect(local.every((t) => t.endsWith("T09:00:00"))).toBe(true);
    expect(local.map((t) => toInstant(t, NY).toISOString())).toEqual([
      "1997-09-02T13:00:00.000Z",
      "1997-09-09T13:00:00.000Z",
      "1997-09-16T13:00:00.000Z",
      "1997-09-23T13:00:00.000Z",
      "1997-09-30T13:00:00.000Z",
      "1997-10-07T13:00:00.000Z",
      "1997-10-14T13:00:00.000Z",
      "1997-10-21T13:00:00.000Z",
      "1997-10-28T14:00:00.000Z",
      "1997-11-04T14:00:00.000Z",
    ]);
  });

  it("expands an open-ended rule within a range (inclusive)", () => {
    // Derived: 2026-01-05 is a Monday.
    expect(
      expandRecurrence("FREQ=WEEKLY;BYDAY=MO,FR", "2026-01-01T06:00:00", {
        from: "2026-01-05T06:00:00",
        until: "2026-01-12T06:00:00",
      }),
    ).toEqual(["2026-01-05T06:00:00", "2026-01-09T06:00:00", "2026-01-12T06:00:00"]);
  });

  it("refuses to list an unbounded rule without a range", () => {
    expect(() => expandRecurrence("FREQ=DAILY", "2026-01-01T06:00:00")).toThrow(RangeError);
  });
});

describe("validateRecurrence", () => {
  it.each([
    "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU",
    "FREQ=WEEKLY;BYDAY=SA",
    "FREQ=DAILY",
    "FREQ=DAILY;BYDAY=MO,WE",
    "FREQ=WEEKLY;INTERVAL=1;WKST=SU;BYDAY=TU,TH",
    // RFC 5545 §3.1: names and enumerated values are case-insensitive.
    "freq=weekly;byday=mo",
  ])("accepts %s", (rule) => {
    expect(validateRecurrence(rule)).toEqual({ ok: true });
  });

  it.each([
    ["", /empty/],
    ["FREQ=MONTHLY;BYMONTHDAY=1", /DAILY and FREQ=WEEKLY/],
    ["FREQ=HOURLY", /DAILY and FREQ=WEEKLY/],
    ["BYDAY=MO", /FREQ is required/],
    ["FREQ=WEEKLY", /needs BYDAY/],
    ["FREQ=WEEKLY;BYDAY=1MO", /weekdays/],
    ["FREQ=WEEKLY;BYDAY=MO,XX", /weekdays/],
    ["FREQ=WEEKLY;BYDAY=MO,MO", /twice/],
    ["FREQ=WEEKLY;BYDAY=MO;BYDAY=TU", /more than once/],
    ["FREQ=WEEKLY;INTERVAL=2;BYDAY=TU", /INTERVAL=1/],
    ["FREQ=WEEKLY;COUNT=10;BYDAY=TU", /season/],
    ["FREQ=DAILY;UNTIL=20261231T000000Z", /season/],
    ["FREQ=DAILY;BYHOUR=9", /start time/],
    ["FREQ=DAILY;BYMONTH=1,2,12", /BYMONTH is not supported/],
    ["FREQ=WEEKLY;BYDAY=MO;WKST=XX", /WKST/],
    ["DTSTART:20260101T000000\nRRULE:FREQ=DAILY", /without DTSTART/],
    ["RRULE:FREQ=DAILY", /without DTSTART/],
    ["FREQ=DAILY; BYDAY=MO", /spaces/],
    ["FREQ=DAILY;", /NAME=VALUE/],
    ["FREQ=DAILY;BYDAY=" + "MO,".repeat(90) + "TU", /longer than 255/],
  ])("refuses %j", (rule, message) => {
    const result = validateRecurrence(rule);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error).toMatch(message);
  });
});
