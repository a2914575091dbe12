// Runtime, kWh and cost from the real switch log and roll-up in MariaDB: a heater on
// across midnight, across a tariff edge, across a tariff change, on at the report's
// start and still on at its end; metered beside rated; a rebuild equal to the upkeep.
import { randomUUID } from "node:crypto";
import { asc, eq, inArray } from "drizzle-orm";
import { DateTime } from "luxon";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { rebuildEnergyDays, refreshEnergyDays } from "@/db/energy-days";
import { getEnergyReport } from "@/db/queries/energy";
import { energyDays, houses, meterSamples, plugs, sites, switchEvents, tariffRates, tariffs } from "@/db/schema";

const ZONE = "Europe/London";
const local = (iso: string) => DateTime.fromISO(iso, { zone: ZONE }).toJSDate();

const siteId = randomUUID();
const houseId = randomUUID();
const heaterId = randomUUID();
const meteredId = randomUUID();

async function logSwitch(plugId: string, localIso: string, toOn: boolean, ratedWatts: number) {
  const at = local(localIso);
  await getDb()
    .insert(switchEvents)
    .values({ plugId, at, fromOn: !toOn, toOn, cause: "schedule", ratedWatts: toOn ? ratedWatts : null, commandId: randomUUID(), ackAt: at, latencyMs: 0 });
  await refreshEnergyDays(getDb(), [{ plugId, fromMs: at.getTime(), toMs: at.getTime() }]);
}

async function sample(plugId: string, localIso: string, wattHours: number) {
  const at = local(localIso);
  await getDb().insert(meterSamples).values({ plugId, at, wattHours });
  await refreshEnergyDays(getDb(), [{ plugId, fromMs: at.getTime(), toMs: at.getTime() }]);
}

const report = (fromDay: string, toDay: string, now = local("2026-06-01T00:00")) => getEnergyReport({ siteId, fromDay, toDay, bucket: "day", now });
const plugIn = (r: Awaited<ReturnType<typeof report>>, id: string) => r.houses.flatMap((h) => h.plugs).find((p) => p.id === id)!;

beforeAll(async () => {
  const db = getDb();
  await db.insert(sites).values({ id: siteId, slug: `energy-${siteId.slice(0, 8)}`, name: "Energy test", timeZone: ZONE, currency: "GBP" });
  await db.insert(houses).values({ id: houseId, siteId, name: "Long house", kind: "glasshouse", lengthM: 6, widthM: 3, eaveHeightM: 2, ridgeHeightM: 3, glazing: "single_glass", highLimitC: 30 });
  await db.insert(plugs).values([
    { id: heaterId, siteId, houseId, deviceId: "heater-1", name: "Heater", applianceKind: "heater", applianceWatts: 2000, ratedCurrentA: 13 },
    { id: meteredId, siteId, houseId, deviceId: "heater-2", name: "Metered heater", applianceKind: "heater", applianceWatts: 1000, ratedCurrentA: 13, metersEnergy: true },
  ]);
  // Until 31 March: night 00:30–07:30 at 0.10, day at 0.30, 0.50 a day, 5 % tax.
  // From 1 April: flat 0.25, 0.60 a day, no tax.
  const [twoRate, flat] = [randomUUID(), randomUUID()];
  await db.insert(tariffs).values([
    { id: twoRate, siteId, name: "Two-rate", kind: "time_of_use", standingChargePerDay: 0.5, taxPercent: 5, validFrom: "2026-01-01", validUntil: "2026-03-31" },
    { id: flat, siteId, name: "Flat", kind: "flat", standingChargePerDay: 0.6, taxPercent: 0, validFrom: "2026-04-01" },
  ]);
  await db.insert(tariffRates).values([
    { id: "night-" + twoRate.slice(0, 8), tariffId: twoRate, label: "Night", startsAt: "00:30:00", endsAt: "07:30:00", pricePerKwh: 0.1 },
    { id: "day-" + twoRate.slice(0, 8), tariffId: twoRate, label: "Day", startsAt: "07:30:00", endsAt: "00:30:00", pricePerKwh: 0.3 },
    { id: "flat-" + flat.slice(0, 8), tariffId: flat, label: "Any time", startsAt: "00:00:00", endsAt: "00:00:00", pricePerKwh: 0.25 },
  ]);

  // Across midnight and the 00:30 night edge.
  await logSwitch(heaterId, "2026-03-10T22:00", true, 2000);
  await logSwitch(heaterId, "2026-03-11T02:00", false, 2000);
  // Across the tariff change at local midnight (British Summer Time by then).
  await logSwitch(heaterId, "2026-03-31T23:00", true, 2000);
  await logSwitch(heaterId, "2026-04-01T01:00", false, 2000);
  // A heater switched on before the report starts, and written late: its off came first.
  await logSwitch(heaterId, "2026-04-10T10:00", false, 2000);
  await logSwitch(heaterId, "2026-04-09T20:00", true, 2000);
  // Metered: 1 kW rated, its meter says 900 Wh an hour.
  await logSwitch(meteredId, "2026-04-02T10:00", true, 1000);
  await sample(meteredId, "2026-04-02T10:00", 5000);
  await sample(meteredId, "2026-04-02T11:00", 5900);
  await sample(meteredId, "2026-04-02T12:00", 6800);
  await logSwitch(meteredId, "2026-04-02T12:00", false, 1000);
});

describe("the energy report", () => {
  it("splits a heater on across midnight at local midnight and at the night rate's edge", async () => {
    const r = await report("2026-03-10", "2026-03-11");
    const [tenth, eleventh] = r.series;
    expect(tenth!.onHours).toBeCloseTo(2, 9);
    expect(eleventh!.onHours).toBeCloseTo(2, 9);
    // 10th: 2 h × 2 kW at the day rate; 11th: 0.5 h day + 1.5 h night, all with 5 % tax.
    expect(tenth!.cost).toBeCloseTo(4 * 0.3 * 1.05, 9);
    expect(eleventh!.cost).toBeCloseTo((1 * 0.3 + 3 * 0.1) * 1.05, 9);
    expect(r.site.standingCharge).toBeCloseTo(2 * 0.5 * 1.05, 9);
    expect(r.site.total).toBeCloseTo((4 * 0.3 + 1 * 0.3 + 3 * 0.1 + 2 * 0.5) * 1.05, 9);
  });

  it("uses each tariff for its own dates when the heater is on across the change", async () => {
    const r = await report("2026-03-31", "2026-04-01");
    expect(r.tariffs.map((t) => [t.name, t.days])).toEqual([
      ["Two-rate", 1],
      ["Flat", 1],
    ]);
    // 23:00–00:00 on the 31st at the day rate (2 kWh), 00:00–01:00 on the 1st flat (2 kWh).
    expect(r.series[0]!.cost).toBeCloseTo(2 * 0.3 * 1.05, 9);
    expect(r.series[1]!.cost).toBeCloseTo(2 * 0.25, 9);
    expect(r.site.standingCharge).toBeCloseTo(0.5 * 1.05 + 0.6, 9);
  });

  it("counts a heater on at the report's start from the start, and one still on up to now", async () => {
    const r = await report("2026-04-10", "2026-04-10");
    expect(plugIn(r, heaterId).onHours).toBeCloseTo(10, 9);
    expect(plugIn(r, heaterId).ratedKwh).toBeCloseTo(20, 9);

    await logSwitch(heaterId, "2026-05-01T08:00", true, 2000);
    const live = await report("2026-05-01", "2026-05-31", local("2026-05-01T09:30"));
    expect(plugIn(live, heaterId).onHours).toBeCloseTo(1.5, 9);
    expect(live.daysElapsed).toBe(1);
    await logSwitch(heaterId, "2026-05-01T10:00", false, 2000);
    const closed = await report("2026-05-01", "2026-05-31", local("2026-05-20T12:00"));
    expect(plugIn(closed, heaterId).onHours).toBeCloseTo(2, 9);
  });

  it("shows metered kWh beside rated, and costs the metered", async () => {
    const r = await report("2026-04-02", "2026-04-02");
    const metered = plugIn(r, meteredId);
    expect(metered.ratedKwh).toBeCloseTo(2, 9);
    expect(metered.meteredKwh).toBeCloseTo(1.8, 9);
    expect(metered.costedKwh).toBeCloseTo(1.8, 9);
    expect(metered.cost).toBeCloseTo(1.8 * 0.25, 9);
    expect(plugIn(r, heaterId).meteredKwh).toBeNull();
  });

  it("costs a metering plug at its rated power where its meter was not heard", async () => {
    await logSwitch(meteredId, "2026-04-03T10:00", true, 1000);
    await logSwitch(meteredId, "2026-04-03T13:00", false, 1000);
    const r = await report("2026-04-03", "2026-04-03");
    const metered = plugIn(r, meteredId);
    expect(metered.meteredKwh).toBeNull();
    expect(metered.costedKwh).toBeCloseTo(3, 9);
    expect(metered.cost).toBeCloseTo(3 * 0.25, 9);
  });

  it("gives the same totals by day, by week and by month", async () => {
    const [byDay, byWeek, byMonth] = await Promise.all(
      (["day", "week", "month"] as const).map((bucket) => getEnergyReport({ siteId, fromDay: "2026-03-04", toDay: "2026-04-20", bucket, now: local("2026-06-01T00:00") })),
    );
    for (const other of [byWeek!, byMonth!]) {
      expect(other.site.onHours).toBeCloseTo(byDay!.site.onHours, 9);
      expect(other.site.total!).toBeCloseTo(byDay!.site.total!, 9);
      expect(other.series.reduce((s, b) => s + b.onHours, 0)).toBeCloseTo(byDay!.site.onHours, 9);
    }
    expect(byWeek!.series[0]).toMatchObject({ fromDay: "2026-03-04", toDay: "2026-03-08" });
    expect(byMonth!.series.map((b) => [b.key, b.fromDay])).toEqual([
      ["2026-03-01", "2026-03-04"],
      ["2026-04-01", "2026-04-01"],
    ]);
  });

  it("a 23-hour day: a heater on all of the spring-forward day runs 23.0 h (IANA rules for Europe/London, 29 March 2026)", async () => {
    await logSwitch(heaterId, "2026-03-28T20:00", true, 2000);
    await logSwitch(heaterId, "2026-03-30T04:00", false, 2000);
    const r = await report("2026-03-29", "2026-03-29");
    expect(plugIn(r, heaterId).onHours).toBe(23);
  });

  it("rebuilding from the log gives the roll-up the upkeep made, row for row", async () => {
    const db = getDb();
    const rowsNow = () => db.select().from(energyDays).where(inArray(energyDays.plugId, [heaterId, meteredId])).orderBy(asc(energyDays.plugId), asc(energyDays.day), asc(energyDays.rateKey));
    const kept = await rowsNow();
    expect(kept.length).toBeGreaterThan(5);
    await db.delete(energyDays).where(eq(energyDays.plugId, heaterId));
    const done = await rebuildEnergyDays(db, { siteIds: [siteId] });
    expect(done.plugs).toBe(2);
    const rebuilt = await rowsNow();
    expect(rebuilt.map(({ meteredWs: _m, ...r }) => r)).toEqual(kept.map(({ meteredWs: _m, ...r }) => r));
    rebuilt.forEach((r, i) => expect(Math.abs((r.meteredWs ?? 0) - (kept[i]!.meteredWs ?? 0))).toBeLessThan(1e-6));

    // Refreshes running at once, over both plugs and the whole year, count nothing twice.
    const everything = [heaterId, meteredId].map((plugId) => ({ plugId, fromMs: local("2026-01-01T00:00").getTime(), toMs: local("2026-12-31T00:00").getTime() }));
    await Promise.all([refreshEnergyDays(db, everything), refreshEnergyDays(db, everything), refreshEnergyDays(db, everything.slice(1))]);
    expect((await rowsNow()).map(({ meteredWs: _m, ...r }) => r)).toEqual(kept.map(({ meteredWs: _m, ...r }) => r));
  });
});
