// The switch history's pure parts: what each switch was, the cursor, local times across
// clock changes (the fast formatter against luxon), CSV cells safe from formulas, the
// filter schema.
import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { switchFilterSchema, switchPageSchema } from "@/lib/schemas/switch-history";
import { csvText } from "@/lib/csv";
import { decodeSwitchCursor, encodeSwitchCursor, exportFileName, localTimestamp, localTimestampFormatter, switchStatus } from "@/lib/switch-history";
import { switchCsvHeader, switchCsvRecords } from "@/lib/switch-history-csv";

describe("switchStatus", () => {
  const at = new Date("2026-01-01T00:00:00Z");
  it("tells carried out, withdrawn, observed and unconfirmed apart; withdrawn wins", () => {
    expect(switchStatus({ cause: "schedule", withdrawnAt: null, ackAt: at })).toBe("carried_out");
    expect(switchStatus({ cause: "override", withdrawnAt: at, ackAt: null })).toBe("withdrawn");
    expect(switchStatus({ cause: "plug_fallback", withdrawnAt: null, ackAt: null })).toBe("observed");
    expect(switchStatus({ cause: "resync", withdrawnAt: null, ackAt: null })).toBe("observed");
    expect(switchStatus({ cause: "safety", withdrawnAt: null, ackAt: null })).toBe("unconfirmed");
  });
});

describe("the cursor", () => {
  it("round-trips any (at, id) and refuses anything it did not make", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 4_102_444_800_000 }), fc.integer({ min: 1, max: Number.MAX_SAFE_INTEGER }), (ms, id) => {
        const cursor = encodeSwitchCursor({ at: new Date(ms), id });
        expect(decodeSwitchCursor(cursor)).toEqual({ at: new Date(ms), id });
      }),
    );
    for (const bad of ["", "42", "s1", "s1abc", "s1-1", "s1zz-0", "x1abc-1", "s1abc-1;drop"]) expect(decodeSwitchCursor(bad), bad).toBeNull();
  });
});

describe("local times", () => {
  // Europe/London: clocks forward 2026-03-29 01:00 UTC, back 2026-10-25 01:00 UTC; America/New_York:
  // 2026-03-08 07:00 UTC and 2026-11-01 06:00 UTC; Australia/Lord_Howe moves by 30 minutes;
  // Asia/Kathmandu sits at +05:45 (IANA tz database).
  const zones = ["Europe/London", "America/New_York", "Australia/Lord_Howe", "Asia/Kathmandu", "UTC"];

  it("writes the offset, so the repeated hour reads apart", () => {
    expect(localTimestamp(new Date("2026-10-25T00:30:00Z"), "Europe/London")).toBe("2026-10-25 01:30:00 +01:00");
    expect(localTimestamp(new Date("2026-10-25T01:30:00Z"), "Europe/London")).toBe("2026-10-25 01:30:00 +00:00");
    expect(localTimestamp(new Date("2026-03-29T01:00:00Z"), "Europe/London")).toBe("2026-03-29 02:00:00 +01:00");
  });

  it("the export's formatter agrees with luxon every minute across each clock change, and at random instants", () => {
    for (const zone of zones) {
      const format = localTimestampFormatter(zone);
      for (const change of ["2026-03-08T00:00:00Z", "2026-03-29T00:00:00Z", "2026-04-05T14:00:00Z", "2026-10-04T14:00:00Z", "2026-10-25T00:00:00Z", "2026-11-01T04:00:00Z"]) {
        const start = new Date(change).getTime();
        for (let ms = start; ms < start + 4 * 3_600_000; ms += 60_000 + 7) expect(format(new Date(ms)), `${zone} ${ms}`).toBe(localTimestamp(new Date(ms), zone));
      }
      fc.assert(fc.property(fc.integer({ min: 1_600_000_000_000, max: 1_900_000_000_000 }), (ms) => format(new Date(ms)) === localTimestamp(new Date(ms), zone)));
    }
  });
});

describe("CSV cells", () => {
  it("defuses text a spreadsheet would run as a formula (OWASP: CSV Injection) and leaves the rest alone", () => {
    for (const risky of ["=1+1", "+SUM(A1)", "-2+3", "@cmd", "\t=1", "\r=1"]) expect(csvText(risky)).toBe(`'${risky}`);
    for (const plain of ["Bench heater", "Pat O'Neill", "a=b", "", "12 °C"]) expect(csvText(plain)).toBe(plain);
    expect(csvText(null)).toBe("");
  });

  it("makes one record per switch in the header's order", () => {
    const record = switchCsvRecords("Europe/London")({
      at: new Date("2026-07-01T12:00:00Z"),
      houseName: "=House",
      plugName: "Heater",
      fromOn: null,
      toOn: true,
      cause: "override",
      status: "carried_out",
      readingTempC: 7,
      readingAt: new Date("2026-07-01T11:59:30Z"),
      userName: "Pat",
      reason: "-frost",
      latencyMs: 412,
      commandId: "c-1",
    });
    expect(record).toHaveLength(switchCsvHeader("Europe/London").length);
    expect(record).toEqual(["2026-07-01 13:00:00 +01:00", "2026-07-01T12:00:00.000Z", "'=House", "Heater", "", "on", "Manual override", "Carried out", "7.00", "2026-07-01T11:59:30.000Z", "Pat", "'-frost", "412", "c-1"]);
  });

  it("names the file after the site and the dates", () => {
    expect(exportFileName("fernhollow", { from: "2026-01-01", to: "2026-01-31" }, "2026-02-02")).toBe("fernhollow-switches-2026-01-01-to-2026-01-31.csv");
    expect(exportFileName("fernhollow", { from: "2026-01-01" }, "2026-02-02")).toBe("fernhollow-switches-2026-01-01-to-2026-02-02.csv");
    expect(exportFileName("fernhollow", {}, "2026-02-02")).toBe("fernhollow-switches-all-to-2026-02-02.csv");
  });
});

describe("the filter schema", () => {
  it("takes each filter as text and refuses what is wrong with a message", () => {
    expect(switchFilterSchema.safeParse({ cause: "override", from: "2026-03-29", to: "2026-03-29" }).success).toBe(true);
    const issues = (value: unknown) => (switchPageSchema.safeParse(value).error?.issues ?? []).map((i) => `${i.path.join(".")}: ${i.message}`);
    expect(issues({ to: "2026-01-01", from: "2026-02-01" })).toEqual(["to: To must be on or after From"]);
    expect(issues({ limit: "0" })[0]).toMatch(/^limit: Limit must be at least 1/);
    expect(issues({ cause: "weather" })[0]).toMatch(/^cause: Cause must be one of safety, override/);
    expect(issues({ cursor: "abc" })).toEqual(["cursor: Cursor is not one this list gave out"]);
    expect(switchPageSchema.parse({}).limit).toBe(50);
    expect(DateTime.fromISO("2026-02-30").isValid).toBe(false);
    expect(issues({ from: "2026-02-30" })).toEqual(["from: From is not a date in the calendar"]);
  });
});
