// The export's hand-built CSV lines against the reference: switchCsvRecords written by
// csv-stringify and read back by csv-parse, for rows that test quoting, formulas, nulls
// and a clock change; and local times from the server's UTC text against luxon.
import { parse } from "csv-parse/sync";
import { stringify } from "csv-stringify/sync";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { csvCell, csvLine } from "@/lib/csv";
import { SWITCH_CAUSES } from "@/lib/domain";
import { isoFromUtcText, localTimestamp, SWITCH_STATUSES, utcTextTimestampFormatter } from "@/lib/switch-history";
import { switchCsvHead, switchCsvHeader, switchCsvLines, switchCsvRecords, type CsvSwitch } from "@/lib/switch-history-csv";

const utcText = (at: Date) => at.toISOString().slice(0, 23).replace("T", " ");

describe("CSV cells", () => {
  it("quote only what csv-stringify quotes, the same way", () => {
    const tricky = fc.string({ unit: fc.constantFrom("a", " ", '"', ",", "\r", "\n", "'", "=", "é", "°") });
    fc.assert(fc.property(fc.array(tricky, { minLength: 1, maxLength: 5 }), (fields) => csvLine(fields) === stringify([fields])));
    expect(csvCell('say "hi", then\nleave')).toBe('"say ""hi"", then\nleave"');
    expect(csvCell("plain")).toBe("plain");
  });
});

describe("local times from UTC text", () => {
  // Clock changes (IANA tz database): Europe/London 2026-03-29 01:00 and 2026-10-25 01:00 UTC;
  // America/New_York 2026-03-08 07:00 and 2026-11-01 06:00 UTC; Australia/Lord_Howe moves by
  // 30 minutes (2026-04-04 15:00 and 2026-10-03 15:30 UTC); Asia/Kathmandu sits at +05:45;
  // Africa/Monrovia kept -00:44:30 until 1972, an offset no quarter-hour cache can hold.
  const zones = ["Europe/London", "America/New_York", "Australia/Lord_Howe", "Asia/Kathmandu", "UTC", "Africa/Monrovia"];

  it("agree with luxon every minute and a bit across each clock change, and at random instants", () => {
    for (const zone of zones) {
      const format = utcTextTimestampFormatter(zone);
      const agrees = (ms: number) => format(utcText(new Date(ms))) === localTimestamp(new Date(ms), zone);
      for (const change of ["1960-06-01T00:00:00Z", "2026-03-08T05:00:00Z", "2026-03-29T00:00:00Z", "2026-04-04T13:00:00Z", "2026-10-03T14:00:00Z", "2026-10-25T00:00:00Z", "2026-11-01T04:00:00Z"]) {
        const start = new Date(change).getTime();
        for (let ms = start; ms < start + 4 * 3_600_000; ms += 60_000 + 7_001) expect(agrees(ms), `${zone} ${new Date(ms).toISOString()}`).toBe(true);
      }
      fc.assert(fc.property(fc.integer({ min: -500_000_000_000, max: 4_000_000_000_000 }), agrees));
    }
  });

  it("give the repeated hour its two offsets, and the ISO column", () => {
    const london = utcTextTimestampFormatter("Europe/London");
    expect(london("2026-10-25 00:30:00.000")).toBe("2026-10-25 01:30:00 +01:00");
    expect(london("2026-10-25 01:30:00.000")).toBe("2026-10-25 01:30:00 +00:00");
    expect(isoFromUtcText("2026-10-25 01:30:00.250")).toBe("2026-10-25T01:30:00.250Z");
  });
});

describe("switchCsvLines", () => {
  const zone = "Europe/London";
  const base: CsvSwitch = {
    at: new Date("2026-07-01T12:00:00.123Z"),
    houseName: "North house",
    plugName: "Bench heater",
    fromOn: false,
    toOn: true,
    cause: "schedule",
    status: "carried_out",
    readingTempC: 7.5,
    readingAt: new Date("2026-07-01T11:59:30.000Z"),
    userName: null,
    reason: null,
    latencyMs: 300,
    commandId: "c-1",
  };
  const tricky: CsvSwitch[] = [
    base,
    { ...base, houseName: "House, east", plugName: 'The "big" heater', reason: "Door open\nfor deliveries\r\nall day" },
    { ...base, houseName: "=HYPERLINK(\"http://x.example\")", plugName: "+1", userName: "@Pat", reason: "-frost, tonight", cause: "override" },
    { ...base, fromOn: null, readingTempC: null, readingAt: null, latencyMs: null, status: "unconfirmed", cause: "safety" },
    { ...base, at: new Date("2026-10-25T00:30:00.000Z"), status: "withdrawn" },
    { ...base, at: new Date("2026-10-25T01:30:00.000Z"), cause: "plug_fallback", status: "observed", readingTempC: -3.25 },
    { ...base, at: new Date("2026-03-29T00:59:59.999Z"), readingTempC: 0 },
    { ...base, at: new Date("2026-03-29T01:00:00.000Z"), userName: "Zoë Ó'Brien", reason: "\t=cmd" },
  ];
  // As the stream hands them over: UTC text, and the DECIMAL reading as the driver's text.
  const asStreamed = (row: CsvSwitch) => ({
    ...row,
    at: utcText(row.at),
    readingAt: row.readingAt && utcText(row.readingAt),
    readingTempC: row.readingTempC === null ? null : row.readingTempC.toFixed(2),
  });

  it("write byte for byte what csv-stringify writes of switchCsvRecords, and read back the same", () => {
    const line = switchCsvLines(zone);
    const records = tricky.map(switchCsvRecords(zone));
    const written = switchCsvHead(zone) + tricky.map((row) => line(asStreamed(row))).join("");
    expect(written).toBe("\uFEFF" + stringify([switchCsvHeader(zone), ...records]));
    expect(parse(written, { bom: true })).toEqual([switchCsvHeader(zone), ...records]);
    expect(records[4]![0]).toBe("2026-10-25 01:30:00 +01:00");
    expect(records[5]![0]).toBe("2026-10-25 01:30:00 +00:00");
  });

  it("agree with switchCsvRecords for any cause, status and typed text", () => {
    const text = fc.option(fc.string({ unit: fc.constantFrom("a", '"', ",", "\n", "\r", "=", "+", "-", "@", "\t", " ") }));
    const row = fc.record({
      at: fc.integer({ min: 1_600_000_000_000, max: 1_900_000_000_000 }).map((ms) => new Date(ms)),
      houseName: fc.string(),
      plugName: fc.string(),
      fromOn: fc.option(fc.boolean()),
      toOn: fc.boolean(),
      cause: fc.constantFrom(...SWITCH_CAUSES),
      status: fc.constantFrom(...SWITCH_STATUSES),
      readingTempC: fc.option(fc.integer({ min: -99_999, max: 99_999 }).map((n) => n / 100)),
      readingAt: fc.option(fc.integer({ min: 1_600_000_000_000, max: 1_900_000_000_000 }).map((ms) => new Date(ms))),
      userName: text,
      reason: text,
      latencyMs: fc.option(fc.nat(100_000)),
      commandId: fc.string(),
    });
    const line = switchCsvLines(zone);
    const record = switchCsvRecords(zone);
    fc.assert(fc.property(row, (r) => line(asStreamed(r)) === stringify([record(r)])));
  });
});
