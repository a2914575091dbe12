// Degree-days per house and local day (db/queries/degree-days.ts) against the real
// MariaDB, across the day the clocks go back in London: per-minute rows written here
// as the controller's roll-up would write them, and the figures worked out by hand.
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { insertMany } from "@/db/bulk";
import { getDb } from "@/db/client";
import { getDegreeDayReport, type DegreeDayReport } from "@/db/queries/degree-days";
import { energyDays, houses, plugs, readingMinutes, sensors, sites } from "@/db/schema";

const db = getDb();
const MIN = 60_000;

const siteId = randomUUID();
const bareSiteId = randomUUID();
const otherSiteId = randomUUID();
const houseId = randomUUID();
const bareHouseId = randomUUID();
const otherHouseId = randomUUID();
const insideId = randomUUID();
const outsideId = randomUUID();
const otherOutsideId = randomUUID();
const heaterId = randomUUID();
const lightId = randomUUID();

// 27 October 2030 is the last Sunday of October: London leaves summer time at 01:00 UTC
// (IANA tz rules for Europe/London), so the local day runs 23:00 UTC on the 26th to
// 00:00 UTC on the 28th, 25 hours.
const DAY_START = Date.parse("2030-10-26T23:00:00Z");
const DAY_END = Date.parse("2030-10-28T00:00:00Z");

const site = (id: string, name: string) => ({ id, slug: `dd-${id.slice(0, 8)}`, name, timeZone: "Europe/London", currency: "GBP" });
const house = (id: string, site: string, name: string) => ({
  id,
  siteId: site,
  name,
  kind: "glasshouse" as const,
  lengthM: 6,
  widthM: 3,
  eaveHeightM: 2,
  ridgeHeightM: 2.8,
  glazing: "single_glass" as const,
});
const sensor = (id: string, site: string, houseOf: string, placement: "inside" | "outside", name: string) => ({
  id,
  siteId: site,
  houseId: houseOf,
  deviceId: `s-${id.slice(0, 8)}`,
  name,
  placement,
});
const minuteRow = (sensorId: string, ms: number, meanC: number) => ({
  sensorId,
  minute: new Date(ms),
  samples: 4,
  tempMinC: meanC - 0.5,
  tempMaxC: meanC + 0.5,
  tempMeanC: meanC,
  rhMean: 80,
});
const heaterPlug = (id: string, kind: "heater" | "light") => ({
  id,
  siteId,
  houseId,
  deviceId: `p-${id.slice(0, 8)}`,
  name: kind,
  applianceKind: kind,
  applianceWatts: 2000,
  ratedCurrentA: 13,
});

beforeAll(async () => {
  await db.insert(sites).values([site(siteId, "Degree Garden"), site(bareSiteId, "No Outside Garden"), site(otherSiteId, "Other Garden")]);
  await db.insert(houses).values([house(houseId, siteId, "Glass"), house(bareHouseId, bareSiteId, "Lone"), house(otherHouseId, otherSiteId, "Theirs")]);
  await db.insert(sensors).values([
    sensor(insideId, siteId, houseId, "inside", "Bench air"),
    sensor(outsideId, siteId, houseId, "outside", "North wall"),
    sensor(otherOutsideId, otherSiteId, otherHouseId, "outside", "Their yard"),
    sensor(randomUUID(), bareSiteId, bareHouseId, "inside", "Lone air"),
  ]);
  await db.insert(plugs).values([heaterPlug(heaterId, "heater"), heaterPlug(lightId, "light")]);

  const rows: ReturnType<typeof minuteRow>[] = [];
  // The 25-hour day: outside 4 °C for its first 750 minutes and 12 °C for the last 750
  // (each minute ±0.5 °C), so lowest 3.5, highest 12.5, mean 8; inside 10 °C all day.
  for (let i = 0; i < 1500; i++) {
    const ms = DAY_START + i * MIN;
    rows.push(minuteRow(outsideId, ms, i < 750 ? 4 : 12));
    rows.push(minuteRow(insideId, ms, 10));
  }
  // The minutes either side belong to the neighbouring days: were they counted, the
  // lowest or highest would show it.
  rows.push(minuteRow(outsideId, DAY_START - MIN, -20));
  rows.push(minuteRow(outsideId, DAY_END, 30));
  // 28 October (24 h): 1,000 minutes outside, 69 % of the day, below the 75 % rule.
  for (let i = 1; i <= 1000; i++) rows.push(minuteRow(outsideId, DAY_END + i * MIN, 6));
  // Another site's outside sensor reads the 28th fully, and must not stand in.
  for (let i = 0; i < 1440; i++) rows.push(minuteRow(otherOutsideId, DAY_END + i * MIN, 0));
  await insertMany(db, readingMinutes, rows);

  // The heater ran 3 h on the 27th (6 kWh) and 1 h on the 28th; the light's kWh is not heating.
  await db.insert(energyDays).values([
    { plugId: heaterId, day: "2030-10-27", onMs: 3 * 3_600_000, ratedWattMs: 2000 * 3 * 3_600_000 },
    { plugId: heaterId, day: "2030-10-28", onMs: 3_600_000, ratedWattMs: 2000 * 3_600_000 },
    { plugId: lightId, day: "2030-10-27", onMs: 3_600_000, ratedWattMs: 2000 * 3_600_000 },
  ]);
});

describe("getDegreeDayReport", () => {
  let report: DegreeDayReport;
  beforeAll(async () => {
    report = await getDegreeDayReport({ siteId, fromDay: "2030-10-26", toDay: "2030-10-28" });
  });

  it("cuts the 25-hour day at its own local midnights and works its figures out", () => {
    const [glass] = report.houses;
    expect(glass!.outsideSensor).toEqual({ id: outsideId, name: "North wall", onThisHouse: true });
    const day = glass!.days.find((d) => d.day === "2030-10-27")!;
    expect(day.outside).toEqual({ minC: 3.5, maxC: 12.5, meanC: 8, coverage: 1 });
    expect(day.insideMeanC).toBe(10);
    // UK Met Office, max 12.5 ≤ 15.5: 15.5 − (12.5 + 3.5) / 2 = 7.5 °C·day (CIBSE TM41's Met Office equations).
    expect(day.degreeDays).toBeCloseTo(7.5, 10);
    expect(day.insideOutside).toBeCloseTo(2, 10); // 10 − 8
    expect(day.heatingKwh).toBeCloseTo(6, 10); // 2 kW × 3 h; the light is left out
    expect(report.unit).toBe("°C·day");
  });

  it("shows a day with too little of it read as missing, not as 0", () => {
    const days = report.houses[0]!.days;
    const before = days.find((d) => d.day === "2030-10-26")!;
    const after = days.find((d) => d.day === "2030-10-28")!;
    expect(before.outside).toBeNull();
    expect(before.degreeDays).toBeNull();
    expect(after.outside).toBeNull();
    expect(after.degreeDays).toBeNull();
    expect(after.insideOutside).toBeNull();
    expect(after.heatingKwh).toBeCloseTo(2, 10); // the kWh are real even when the day's cold is unknown
  });

  it("puts kWh over the house's own kelvin-days where both are known", () => {
    expect(report.houses[0]!.kwhPerKelvinDay).toBeCloseTo(3, 10); // 6 kWh / 2 K·day
    expect(report.houses[0]!.expectedKwhPerKelvinDay).toBeGreaterThan(0);
  });

  it("counts US degree-days in °F·day when the site says so", async () => {
    await db.update(sites).set({ degreeDayMethod: "us_mean" }).where(eq(sites.id, siteId));
    try {
      const us = await getDegreeDayReport({ siteId, fromDay: "2030-10-27", toDay: "2030-10-27" });
      // (max + min) / 2 = 8 °C = 46.4 °F; 65 − 46.4 = 18.6 °F·day (NOAA CPC definition).
      expect(us.houses[0]!.days[0]!.degreeDays).toBeCloseTo(18.6, 10);
      expect(us.unit).toBe("°F·day");
    } finally {
      await db.update(sites).set({ degreeDayMethod: "uk_met_office" }).where(eq(sites.id, siteId));
    }
  });

  it("says there is no outside sensor rather than borrowing another site's", async () => {
    const bare = await getDegreeDayReport({ siteId: bareSiteId, fromDay: "2030-10-27", toDay: "2030-10-28" });
    expect(bare.outsideSensors).toEqual([]);
    expect(bare.houses[0]!.outsideSensor).toBeNull();
    expect(bare.houses[0]!.days.every((d) => d.degreeDays === null && d.outside === null)).toBe(true);
    expect(bare.houses[0]!.heaters).toBe(0);
    expect(bare.houses[0]!.days.every((d) => d.heatingKwh === null)).toBe(true);
  });

  it("takes a metering heater's meter, and its rating on a day its meter gave nothing", async () => {
    await db.update(plugs).set({ metersEnergy: true }).where(eq(plugs.id, heaterId));
    await db.update(energyDays).set({ meteredWs: 5 * 3_600_000 }).where(and(eq(energyDays.plugId, heaterId), eq(energyDays.day, "2030-10-27")));
    try {
      const metered = await getDegreeDayReport({ siteId, fromDay: "2030-10-27", toDay: "2030-10-28" });
      expect(metered.houses[0]!.days.map((d) => d.heatingKwh)).toEqual([5, 2]); // 5 kWh metered; the 28th's 2 kWh from 2 kW × 1 h
    } finally {
      await db.update(plugs).set({ metersEnergy: false }).where(eq(plugs.id, heaterId));
    }
  });

  it("refuses a range that runs backwards", async () => {
    await expect(getDegreeDayReport({ siteId, fromDay: "2030-10-28", toDay: "2030-10-27" })).rejects.toThrow(/after it ends/);
  });
});
