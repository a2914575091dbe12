import { describe, expect, it } from "vitest";
import { parseBillCsv } from "@/lib/bills/csv";
import { checkBill } from "@/lib/bills/check";

describe("bill CSV", () => {
  it("reads a header and bills, with a byte-order mark, CRLF and the columns in any order", () => {
    const result = parseBillCsv("\uFEFFamount,from,to,kwh,label\r\n612.40,2026-09-01,2026-11-30,1840.5,Autumn\r\n\r\n705.1,2026-12-01,2027-02-28,2100,\r\n");
    expect(result).toEqual({
      ok: true,
      bills: [
        { line: 2, startsOn: "2026-09-01", endsOn: "2026-11-30", billedKwh: 1840.5, billedAmount: 612.4, label: "Autumn" },
        { line: 4, startsOn: "2026-12-01", endsOn: "2027-02-28", billedKwh: 2100, billedAmount: 705.1, label: null },
      ],
    });
  });

  it("reports every bad row with its line number and what is wrong, and keeps none", () => {
    const result = parseBillCsv(
      [
        "from,to,kwh,amount",
        "2026-09-01,2026-11-30,1840.5,612.40",
        "01/12/2026,2027-02-28,2100,705.10",
        "2027-03-01,2027-02-28,10,5",
        "2027-03-01,2027-05-31,\"1,234.5\",400",
        "2027-06-01,2027-08-31,12,5",
        "2026-09-01,2026-11-30,1,1",
        "2027-09-01,2027-11-30,-4,1",
        "2027-12-01,2028-02-28,4",
      ].join("\n"),
    );
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.message).toBe("6 lines need fixing; nothing was saved.");
    expect(result.rows).toEqual([
      { line: 3, message: "from: must be a date, YYYY-MM-DD" },
      { line: 4, message: "to: must be on or after From" },
      { line: 5, message: 'kwh "1,234.5": write numbers with a decimal point and no thousands separator, e.g. 1234.56' },
      { line: 7, message: "the same dates as line 2" },
      { line: 8, message: 'kwh "-4" is not a number' },
      { line: 9, message: "has 3 values where the header names 4" },
    ]);
  });

  it("asks for the header, and refuses files that are not CSV text", () => {
    const noHeader = parseBillCsv("2026-09-01,2026-11-30,1840.5,612.40\n");
    expect(noHeader).toMatchObject({ ok: false, rows: [] });
    expect(!noHeader.ok && noHeader.message).toContain("The first line must name the columns: from,to,kwh,amount");
    expect(parseBillCsv("\u0089PNG\r\n\u001a\n\u0000\u0000")).toMatchObject({ ok: false, message: expect.stringContaining("not a CSV text file") });
    expect(parseBillCsv("from,to,kwh,amount\n")).toMatchObject({ ok: false, message: "The file has a header but no bills." });
    expect(parseBillCsv('from,to,kwh,amount\n"2026-09-01,2026-11-30,1,1\n')).toMatchObject({ ok: false, message: expect.stringContaining("stray quote") });
  });

  it("holds a file to its row and size limits", () => {
    const rows = Array.from({ length: 401 }, (_, i) => `2000-01-01,2000-01-${String((i % 28) + 1).padStart(2, "0")},1,1`);
    expect(parseBillCsv(["from,to,kwh,amount", ...rows].join("\n"))).toMatchObject({ ok: false, message: "The file holds 401 bills; upload at most 400 at a time." });
    expect(parseBillCsv(`from,to,kwh,amount\n${"x".repeat(40_000)}`)).toMatchObject({ ok: false, message: "The file is too large: at most 32 kB." });
  });
});

describe("bill check", () => {
  const heating = { kwh: 12, energyCost: 3.57, standingCharge: 0.945, total: 4.515, unpricedKwh: 0, daysCounted: 2 };

  it("leaves for everything else what the bill says less heating's share", () => {
    const check = checkBill({ startsOn: "2025-03-10", endsOn: "2025-03-11", billedKwh: 30, billedAmount: 10 }, heating, 2);
    expect(check.rest!.kwh).toBeCloseTo(18, 9);
    expect(check.rest!.amount).toBeCloseTo(5.485, 9);
    expect(check.heatingShare).toBeCloseTo(0.4, 9);
    expect(check.notes).toEqual([]);
  });

  it("warns where heating alone exceeds the bill, and while the period is still running", () => {
    const check = checkBill({ startsOn: "2025-03-10", endsOn: "2025-03-12", billedKwh: 5, billedAmount: 2 }, heating, 3);
    expect(check.rest!.kwh).toBeCloseTo(-7, 9);
    expect(check.notes[0]).toContain("Heating alone comes to 7.0 kWh more than the bill");
    expect(check.notes[1]).toBe("Only 2 of the period’s 3 days have begun; heating is counted up to today.");
  });

  it("invites the figures of a bill without them", () => {
    expect(checkBill({ startsOn: "2025-03-10", endsOn: "2025-03-11", billedKwh: null, billedAmount: null }, heating, 2)).toMatchObject({ rest: null, heatingShare: null });
  });
});
