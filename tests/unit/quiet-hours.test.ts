// Quiet hours read in the site's zone. Clock changes are those of the IANA time zone
// database (tzdata, as bundled with Node's ICU and read through luxon): Europe/London
// goes from 01:00 GMT to 02:00 BST on Sunday 29 March 2026 and from 02:00 BST back to
// 01:00 GMT on Sunday 25 October 2026 (EU rule: last Sunday of March/October, 01:00 UTC);
// America/New_York is on EST (UTC−5) in December.
import { describe, expect, it } from "vitest";
import { quietHoursEndAt, quietHoursOf } from "@/lib/alerts/quiet-hours";

const at = (iso: string) => new Date(iso);
const end = (iso: string, from: string, until: string, zone = "Europe/London") => quietHoursEndAt(at(iso), { from, until }, zone)?.toISOString() ?? null;

describe("quiet hours", () => {
  it("are none when either end is missing", () => {
    expect(quietHoursOf({ quietFrom: null, quietUntil: null })).toBeNull();
    expect(quietHoursOf({ quietFrom: "22:00", quietUntil: null })).toBeNull();
    expect(quietHoursEndAt(at("2026-12-03T03:00:00Z"), null, "Europe/London")).toBeNull();
  });

  it("within one day: the start is inside, the end is not", () => {
    expect(end("2026-12-03T12:59:00Z", "13:00", "15:00")).toBeNull();
    expect(end("2026-12-03T13:00:00Z", "13:00", "15:00")).toBe("2026-12-03T15:00:00.000Z");
    expect(end("2026-12-03T14:59:00Z", "13:00", "15:00")).toBe("2026-12-03T15:00:00.000Z");
    expect(end("2026-12-03T15:00:00Z", "13:00", "15:00")).toBeNull();
  });

  it("over midnight: before midnight they end the next morning, after it the same morning", () => {
    expect(end("2026-12-03T21:59:00Z", "22:00", "07:00")).toBeNull();
    expect(end("2026-12-03T22:00:00Z", "22:00", "07:00")).toBe("2026-12-04T07:00:00.000Z");
    expect(end("2026-12-03T23:30:00Z", "22:00", "07:00")).toBe("2026-12-04T07:00:00.000Z");
    expect(end("2026-12-04T03:00:00Z", "22:00", "07:00")).toBe("2026-12-04T07:00:00.000Z");
    expect(end("2026-12-04T07:00:00Z", "22:00", "07:00")).toBeNull();
    expect(end("2026-12-04T12:00:00Z", "22:00", "07:00")).toBeNull();
  });

  it("are read in the site's zone, not the server's", () => {
    // 04:00 UTC is 23:00 EST the evening before: inside 22:00–07:00, ending 07:00 EST = 12:00 UTC.
    expect(end("2026-12-04T04:00:00Z", "22:00", "07:00", "America/New_York")).toBe("2026-12-04T12:00:00.000Z");
    // 23:00 UTC is 18:00 EST: outside.
    expect(end("2026-12-03T23:00:00Z", "22:00", "07:00", "America/New_York")).toBeNull();
  });

  it("end at the wall-clock time on a spring-forward night (the night is an hour shorter)", () => {
    // Saturday 28 March 2026 23:00 GMT; 07:00 BST on Sunday is 06:00 UTC.
    expect(end("2026-03-28T23:00:00Z", "22:00", "07:00")).toBe("2026-03-29T06:00:00.000Z");
  });

  it("end at the wall-clock time on a fall-back night (the night is an hour longer)", () => {
    // Saturday 24 October 2026 23:00 BST = 22:00 UTC; 07:00 GMT on Sunday is 07:00 UTC.
    expect(end("2026-10-24T22:00:00Z", "22:00", "07:00")).toBe("2026-10-25T07:00:00.000Z");
    // During the repeated hour (01:30 BST, then 01:30 GMT) the hold still ends at 07:00 GMT.
    expect(end("2026-10-25T00:30:00Z", "22:00", "07:00")).toBe("2026-10-25T07:00:00.000Z");
    expect(end("2026-10-25T01:30:00Z", "22:00", "07:00")).toBe("2026-10-25T07:00:00.000Z");
  });

  it("an end inside the spring-forward gap moves forward to the first time that exists", () => {
    // 00:30 GMT on 29 March; 01:30 does not exist that night, so the end is 02:30 BST = 01:30 UTC.
    expect(end("2026-03-29T00:30:00Z", "00:00", "01:30")).toBe("2026-03-29T01:30:00.000Z");
    // 01:00 UTC is already 02:00 BST: past the end.
    expect(end("2026-03-29T01:00:00Z", "00:00", "01:30")).toBeNull();
  });

  it("refuses times and zones that are not", () => {
    expect(() => quietHoursEndAt(at("2026-12-03T03:00:00Z"), { from: "25:00", until: "07:00" }, "Europe/London")).toThrow(/not a time of day/);
    expect(() => quietHoursEndAt(at("2026-12-03T03:00:00Z"), { from: "22:00", until: "07:00" }, "Mars/Olympus")).toThrow(/not a time zone/);
  });
});
