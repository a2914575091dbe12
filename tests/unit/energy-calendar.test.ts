import { describe, expect, it } from "vitest";
import { buildSlices, dayOf, dayStartMs, slicesOfDay } from "@/lib/energy/calendar";
import { accumulate, wattMsToKwh, onIntervals, type LoggedSwitch } from "@/lib/energy/runtime";
import { ratePiecesOfDay, tariffOn, tariffProblems, type Tariff } from "@/lib/energy/tariff";

const H = 3_600_000;
const at = (iso: string) => Date.parse(iso);
const on = (iso: string, ratedWatts = 2000): LoggedSwitch => ({ atMs: at(iso), toOn: true, ratedWatts, withdrawn: false });
const off = (iso: string): LoggedSwitch => ({ atMs: at(iso), toOn: false, ratedWatts: null, withdrawn: false });

const twoRate: Tariff = {
  id: "t1",
  name: "Two-rate",
  kind: "time_of_use",
  validFrom: "2026-01-01",
  validUntil: null,
  standingChargePerDay: 0.5,
  taxPercent: 5,
  rates: [
    { id: "night", label: "Night", startsAt: "00:30", endsAt: "07:30", days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], pricePerKwh: 0.13 },
    { id: "day", label: "Day", startsAt: "07:30", endsAt: "00:30", days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], pricePerKwh: 0.28 },
  ],
};

/** Runtime of a heater on all of one local day, from its slices. */
function hoursOfDay(day: string, zone: string) {
  const start = dayStartMs(day, zone);
  const slices = slicesOfDay(day, zone, []);
  const end = slices[slices.length - 1]!.endMs;
  const cells = accumulate(slices, onIntervals([on(new Date(start - H).toISOString()), off(new Date(end + H).toISOString())], { fallbackWatts: 0, openUntilMs: null }), null);
  return [...cells.values()].reduce((s, c) => s + c.onMs, 0) / H;
}

describe("local days follow the IANA rules (through luxon)", () => {
  // IANA tz database, Europe/London: clocks go forward 01:00 GMT on the last Sunday of
  // March (2026-03-29) and back 01:00 GMT on the last Sunday of October (2026-10-25).
  it("a heater on all day runs 23.0 h on London's spring-forward day and 25.0 h on its fall-back day", () => {
    expect(hoursOfDay("2026-03-29", "Europe/London")).toBe(23);
    expect(hoursOfDay("2026-10-25", "Europe/London")).toBe(25);
    expect(hoursOfDay("2026-06-01", "Europe/London")).toBe(24);
  });

  // IANA tz database, America/New_York: second Sunday of March (2026-03-08), first
  // Sunday of November (2026-11-01); Australia/Sydney: first Sunday of October
  // (2026-10-04) forward, first Sunday of April (2026-04-05) back.
  it("and so in New York and, the other way round, in Sydney", () => {
    expect(hoursOfDay("2026-03-08", "America/New_York")).toBe(23);
    expect(hoursOfDay("2026-11-01", "America/New_York")).toBe(25);
    expect(hoursOfDay("2026-10-04", "Australia/Sydney")).toBe(23);
    expect(hoursOfDay("2026-04-05", "Australia/Sydney")).toBe(25);
  });

  it("cuts an interval at local midnight, not UTC midnight", () => {
    // 22:00–02:00 New York time in winter (UTC−5) is 03:00–07:00 UTC on one UTC day.
    const slices = buildSlices({ zone: "America/New_York", fromDay: "2026-01-14", toDay: "2026-01-15", tariffs: [] });
    const cells = accumulate(slices, onIntervals([on("2026-01-15T03:00:00Z"), off("2026-01-15T07:00:00Z")], { fallbackWatts: 0, openUntilMs: null }), null);
    expect([...cells.values()].map((c) => [c.day, c.onMs / H])).toEqual([
      ["2026-01-14", 2],
      ["2026-01-15", 2],
    ]);
    expect(dayOf(at("2026-01-15T03:00:00Z"), "America/New_York")).toBe("2026-01-14");
  });
});

describe("energy", () => {
  it("kWh = kW × h: a 2 kW heater on for 3 h uses 6 kWh (definition of the kilowatt-hour, SI brochure: 1 kWh = 3.6 MJ)", () => {
    const slices = buildSlices({ zone: "UTC", fromDay: "2026-01-01", toDay: "2026-01-01", tariffs: [] });
    const cells = accumulate(slices, onIntervals([on("2026-01-01T10:00:00Z", 2000), off("2026-01-01T13:00:00Z")], { fallbackWatts: 0, openUntilMs: null }), null);
    const [cell] = [...cells.values()];
    expect(wattMsToKwh(cell!.ratedWattMs)).toBe(6);
    expect(cell!.ratedWattMs / 1000).toBe(2000 * 3 * 3600); // watt-seconds = 21.6 MJ / 3.6 MJ per kWh = 6 kWh
  });

  it("skips withdrawn switches, and leaves out an interval still open unless told when to close it", () => {
    const log = [on("2026-01-01T10:00:00Z"), { ...off("2026-01-01T11:00:00Z"), withdrawn: true }, off("2026-01-01T12:00:00Z"), on("2026-01-01T20:00:00Z")];
    expect(onIntervals(log, { fallbackWatts: 0, openUntilMs: null })).toEqual([{ startMs: at("2026-01-01T10:00:00Z"), endMs: at("2026-01-01T12:00:00Z"), watts: 2000 }]);
    expect(onIntervals(log, { fallbackWatts: 0, openUntilMs: at("2026-01-01T21:00:00Z") })).toHaveLength(2);
  });

  it("takes the rated watts of the switch that turned the plug on", () => {
    const log = [on("2026-01-01T10:00:00Z", 1000), on("2026-01-01T11:00:00Z", 3000), off("2026-01-01T12:00:00Z")];
    const slices = buildSlices({ zone: "UTC", fromDay: "2026-01-01", toDay: "2026-01-01", tariffs: [] });
    const [cell] = [...accumulate(slices, onIntervals(log, { fallbackWatts: 0, openUntilMs: null }), null).values()];
    expect(wattMsToKwh(cell!.ratedWattMs)).toBe(4);
  });
});

describe("tariff periods", () => {
  it("splits a day at the tariff's edges in local time, with the wrapping rate's tail after midnight", () => {
    expect(ratePiecesOfDay(twoRate, 3)).toEqual([
      { fromMin: 0, toMin: 30, rateId: "day" },
      { fromMin: 30, toMin: 450, rateId: "night" },
      { fromMin: 450, toMin: 1440, rateId: "day" },
    ]);
    // In summer London is UTC+1: the night rate's 00:30 local is 23:30 UTC the day before.
    const [first, second] = slicesOfDay("2026-07-01", "Europe/London", [twoRate]);
    expect(first).toMatchObject({ rateKey: "day", startMs: at("2026-06-30T23:00:00Z"), endMs: at("2026-06-30T23:30:00Z") });
    expect(second).toMatchObject({ rateKey: "night", endMs: at("2026-07-01T06:30:00Z") });
  });

  it("a heater on across a tariff edge is costed at each rate for its own time", () => {
    const slices = buildSlices({ zone: "UTC", fromDay: "2026-02-02", toDay: "2026-02-02", tariffs: [twoRate] });
    const cells = accumulate(slices, onIntervals([on("2026-02-02T06:30:00Z", 1000), off("2026-02-02T08:30:00Z")], { fallbackWatts: 0, openUntilMs: null }), null);
    expect(Object.fromEntries([...cells.values()].map((c) => [c.rateKey, c.onMs / H]))).toEqual({ night: 1, day: 1 });
  });

  it("knows which tariff is in force on a date, inclusive of both ends", () => {
    const later: Tariff = { ...twoRate, id: "t2", validFrom: "2026-04-01" };
    const earlier: Tariff = { ...twoRate, validUntil: "2026-03-31" };
    expect(tariffOn([earlier, later], "2026-03-31")?.id).toBe("t1");
    expect(tariffOn([earlier, later], "2026-04-01")?.id).toBe("t2");
    expect(tariffOn([earlier], "2025-12-31")).toBeNull();
  });

  it("says where a time-of-use tariff leaves a gap or doubles up", () => {
    expect(tariffProblems(twoRate)).toEqual([]);
    const gap = { ...twoRate, rates: [twoRate.rates[0]!, { ...twoRate.rates[1]!, days: ["MO", "TU", "WE", "TH", "FR"] as const }] } as Tariff;
    expect(tariffProblems(gap)).toContain("No rate covers Saturday 07:30–24:00.");
    expect(tariffProblems(gap)).toContain("No rate covers Sunday 00:00–00:30.");
    const overlap = { ...twoRate, rates: [...twoRate.rates, { ...twoRate.rates[0]!, id: "peak", label: "Peak", startsAt: "17:00", endsAt: "19:00" }] } as Tariff;
    expect(tariffProblems(overlap)[0]).toMatch(/Day and Peak overlap on Monday at 17:00/);
  });
});
