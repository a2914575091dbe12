import { describe, expect, it } from "vitest";
import { minuteOfDay } from "@/lib/energy/tariff";
import { tariffSchema, type TariffInput } from "@/lib/schemas/tariff";
import { WEEKDAYS } from "@/lib/schedules/week";
import { daysToRefresh, overlappingTariff } from "@/lib/tariffs/validity";
import { coverageProblems, describeDayRow, tariffWeek } from "@/lib/tariffs/week";

const everyDay = [...WEEKDAYS];

/** A two-rate night/day tariff of the common kind: cheap hours overnight, the day rate the rest. */
const nightAndDay: TariffInput = {
  name: "Night and day",
  kind: "time_of_use",
  validFrom: "2026-01-01",
  validUntil: null,
  standingChargePerDay: 0.53,
  taxPercent: 5,
  rates: [
    { label: "Night", startsAt: "00:30", endsAt: "07:30", days: everyDay, pricePerKwh: 0.135 },
    { label: "Day", startsAt: "07:30", endsAt: "00:30", days: everyDay, pricePerKwh: 0.285 },
  ],
};

const messages = (input: unknown) => {
  const parsed = tariffSchema.safeParse(input);
  return parsed.success ? [] : parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
};

/** Hours each rate covers on each weekday, from the rates' own times (a wrapped rate's early hours land on the next day). */
function hoursPerDay(rates: TariffInput["rates"]) {
  const hours = new Array<number>(7).fill(0);
  for (const r of rates) {
    const start = minuteOfDay(r.startsAt);
    const end = minuteOfDay(r.endsAt);
    for (const code of r.days) {
      const d = WEEKDAYS.indexOf(code);
      if (end > start) hours[d]! += (end - start) / 60;
      else {
        hours[d]! += (1440 - start) / 60;
        hours[(d + 1) % 7]! += end / 60;
      }
    }
  }
  return hours;
}

describe("tariff schema", () => {
  it("takes a night/day tariff that covers each weekday's 24 h once (common practice, no published source)", () => {
    expect(messages(nightAndDay)).toEqual([]);
    expect(hoursPerDay(nightAndDay.rates)).toEqual([24, 24, 24, 24, 24, 24, 24]);
  });

  it("takes a rate that wraps past midnight, whose early hours fall on the day after each of its days", () => {
    const weekdayNights: TariffInput = {
      ...nightAndDay,
      rates: [
        { label: "Evening", startsAt: "19:00", endsAt: "07:00", days: everyDay, pricePerKwh: 0.12 },
        { label: "Daytime", startsAt: "07:00", endsAt: "19:00", days: everyDay, pricePerKwh: 0.3 },
      ],
    };
    expect(messages(weekdayNights)).toEqual([]);
    expect(hoursPerDay(weekdayNights.rates)).toEqual([24, 24, 24, 24, 24, 24, 24]);
    const monday = tariffWeek("time_of_use", weekdayNights.rates)[0]!;
    expect(describeDayRow(monday, ["Evening", "Daytime"])).toBe("Evening 00:00–07:00, Daytime 07:00–19:00, Evening 19:00–24:00");
  });

  it("names the day and times no rate covers", () => {
    const weekdaysOnly = { ...nightAndDay, rates: nightAndDay.rates.map((r) => (r.label === "Day" ? { ...r, days: WEEKDAYS.slice(0, 5) } : r)) };
    // Saturday and Sunday lose their day rate (07:30–24:00); Friday's still wraps into
    // Saturday 00:00–00:30, but the missing Saturday and Sunday ones leave Sunday and
    // Monday 00:00–00:30 bare.
    expect(hoursPerDay(weekdaysOnly.rates)).toEqual([23.5, 24, 24, 24, 24, 7.5, 7]);
    const found = messages(weekdaysOnly).join(" ");
    expect(found).toContain("No rate covers Saturday 07:30–24:00");
    expect(found).toContain("No rate covers Sunday 07:30–24:00");
    expect(found).toContain("No rate covers Monday 00:00–00:30");
    expect(found).toContain("No rate covers Sunday 00:00–00:30");
    expect(found).not.toContain("Saturday 00:00");
    expect(found).not.toContain("Tuesday");
    // The editor tells the same stretch on several days once.
    expect(coverageProblems(tariffWeek("time_of_use", weekdaysOnly.rates), ["Night", "Day"])).toEqual([
      "No rate covers 00:00–00:30 (Mon, Sun).",
      "No rate covers 07:30–24:00 (Sat, Sun).",
    ]);
  });

  it("names the day and time two rates claim", () => {
    const doubled = { ...nightAndDay, rates: [...nightAndDay.rates, { label: "Boost", startsAt: "06:00", endsAt: "08:00", days: ["WE" as const], pricePerKwh: 0.05 }] };
    expect(hoursPerDay(doubled.rates)[2]).toBe(26);
    expect(messages(doubled).join(" ")).toMatch(/overlap on Wednesday at 06:00/);
    const wednesday = tariffWeek("time_of_use", doubled.rates)[2]!;
    // Boost (06:00–08:00) meets Night until 07:30 and Day from 07:30.
    expect(wednesday.doubled).toEqual([
      { fromMin: 360, toMin: 450, rates: [0, 2] },
      { fromMin: 450, toMin: 480, rates: [2, 1] },
    ]);
    expect(coverageProblems(tariffWeek("time_of_use", doubled.rates), ["Night", "Day", "Boost"])).toEqual([
      "Night and Boost both cover 06:00–07:30 (Wed).",
      "Boost and Day both cover 07:30–08:00 (Wed).",
    ]);
  });

  it("gives a flat tariff exactly one rate", () => {
    const flat = { ...nightAndDay, kind: "flat" };
    expect(messages(flat).join(" ")).toContain("A flat tariff has one unit rate");
    expect(messages({ ...flat, rates: [nightAndDay.rates[0]] })).toEqual([]);
    expect(messages({ ...flat, rates: [] }).join(" ")).toContain("Add at least one unit rate");
  });

  it("refuses times that are not HH:MM, negative or absurd prices, reversed dates and twin rate names", () => {
    const rate = nightAndDay.rates[0]!;
    expect(messages({ ...nightAndDay, rates: [{ ...rate, startsAt: "7:30" }, nightAndDay.rates[1]] })).toContain("rates.0.startsAt: Start must be a time of day, HH:MM (00:00 to 23:59)");
    expect(messages({ ...nightAndDay, rates: [{ ...rate, endsAt: "24:00" }, nightAndDay.rates[1]] })[0]).toMatch(/^rates.0.endsAt/);
    expect(messages({ ...nightAndDay, rates: [{ ...rate, pricePerKwh: -0.1 }, nightAndDay.rates[1]] })).toContain("rates.0.pricePerKwh: Price cannot be negative");
    expect(messages({ ...nightAndDay, rates: [{ ...rate, pricePerKwh: 135 }, nightAndDay.rates[1]] })).toContain("rates.0.pricePerKwh: Price must be at most 100 per kWh");
    expect(messages({ ...nightAndDay, standingChargePerDay: 5300 })).toContain("standingChargePerDay: Standing charge must be at most 1000 per day");
    expect(messages({ ...nightAndDay, taxPercent: 120 })).toContain("taxPercent: Tax must be at most 100 %");
    expect(messages({ ...nightAndDay, validUntil: "2025-12-31" })).toContain("validUntil: Valid until must be on or after valid from");
    expect(messages({ ...nightAndDay, validFrom: "2026-02-30" })).toContain("validFrom: Valid from is not a date in the calendar");
    expect(messages({ ...nightAndDay, rates: [rate, { ...nightAndDay.rates[1]!, label: "night" }] })).toContain("rates.1.label: Give each rate its own name");
    expect(messages({ ...nightAndDay, rates: [{ ...rate, days: [] }, nightAndDay.rates[1]] })[0]).toBe("rates.0.days: Tick at least one day");
  });
});

describe("tariff dates", () => {
  const stored = [
    { id: "a", name: "Winter", validFrom: "2026-01-01", validUntil: "2026-03-31" },
    { id: "b", name: "Spring", validFrom: "2026-04-01", validUntil: null },
  ];

  it("finds the stored tariff a new one shares a day with; touching is fine", () => {
    expect(overlappingTariff({ validFrom: "2025-06-01", validUntil: "2025-12-31" }, stored)).toBeNull();
    expect(overlappingTariff({ validFrom: "2025-06-01", validUntil: "2026-01-01" }, stored)?.name).toBe("Winter");
    expect(overlappingTariff({ validFrom: "2030-01-01", validUntil: null }, stored)?.name).toBe("Spring");
    expect(overlappingTariff({ validFrom: "2025-01-01", validUntil: null }, stored)?.name).toBe("Winter");
  });

  it("refreshes the union of old and new dates, bounded by the days with switches", () => {
    const activity = { firstDay: "2026-02-10", lastDay: "2026-05-03" };
    expect(daysToRefresh(null, { validFrom: "2026-01-01", validUntil: null }, activity)).toEqual({ fromDay: "2026-02-10", toDay: "2026-05-03" });
    expect(daysToRefresh({ validFrom: "2026-03-01", validUntil: "2026-03-31" }, { validFrom: "2026-03-15", validUntil: "2026-04-10" }, activity)).toEqual({
      fromDay: "2026-03-01",
      toDay: "2026-04-10",
    });
    expect(daysToRefresh({ validFrom: "2027-01-01", validUntil: null }, null, activity)).toBeNull();
    expect(daysToRefresh(null, { validFrom: "2026-01-01", validUntil: null }, null)).toBeNull();
  });
});
