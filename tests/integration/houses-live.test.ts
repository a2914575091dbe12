// A house's chart (GET /api/sites/[siteId]/houses/[houseId]/chart) and the live data's
// "in force" fields, against the real MariaDB: rows are written here as the controller
// and the web app would write them.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import * as chartRoute from "@/app/api/sites/[siteId]/houses/[houseId]/chart/route";
import * as sitesRoute from "@/app/api/sites/route";
import { insertMany } from "@/db/bulk";
import { getDb } from "@/db/client";
import { getHouseChart, type HouseChart } from "@/db/queries/house-chart";
import { getSiteLive } from "@/db/queries/live";
import { houses, overrides, plugStates, plugs, readingMinutes, readings, schedules, scheduleWindows, sensors, sites, switchEvents } from "@/db/schema";
import { call, signUp, type Account } from "../support/http";

const db = getDb();
const MIN = 60_000;

let owner: Account;
let siteId: string;
const houseId = randomUUID();
const bareHouseId = randomUUID();
const sensorId = randomUUID();
const heaterId = randomUUID();
const otherSiteId = randomUUID();
const otherHouseId = randomUUID();

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

// Readings follow a known curve; one minute's roll-up row per minute.
const tempAt = (ms: number) => 10 + Math.round(((ms / MIN) % 60) * 10) / 100;

beforeAll(async () => {
  owner = await signUp({ siteName: "Chart Test Garden" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  siteId = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
  await db.insert(sites).values({ id: otherSiteId, slug: `other-${otherSiteId.slice(0, 8)}`, name: "Other", timeZone: "Europe/London", currency: "GBP" });
  await db.insert(houses).values([house(houseId, siteId, "Chart House"), house(bareHouseId, siteId, "Bare House"), house(otherHouseId, otherSiteId, "Not Yours")]);
  await db.insert(sensors).values({ id: sensorId, siteId, houseId, deviceId: `air-${sensorId.slice(0, 8)}`, name: "Air" });
  await db.insert(plugs).values({
    id: heaterId,
    siteId,
    houseId,
    deviceId: `heat-${heaterId.slice(0, 8)}`,
    name: "Bench heater",
    applianceKind: "heater",
    applianceWatts: 2000,
    ratedCurrentA: 13,
    sensorId,
    outsideWindows: "frost",
    frostLowC: 3,
    frostHighC: 5,
  });
  const scheduleId = randomUUID();
  await db.insert(schedules).values({ id: scheduleId, plugId: heaterId, name: "Winter days" });
  await db.insert(scheduleWindows).values({
    id: randomUUID(),
    scheduleId,
    recurrence: "FREQ=DAILY",
    startsAt: "06:00:00",
    durationMin: 12 * 60,
    mode: "band",
    lowC: 8,
    highC: 10,
  });
});

describe("getHouseChart", () => {
  const now = new Date("2030-01-16T12:02:30Z"); // a Wednesday, GMT in the site's London zone
  const nowMs = now.getTime();
  let day: HouseChart;

  beforeAll(async () => {
    // The roll-up holds 8 days up to 12:00; raw readings hold the last 90 minutes,
    // overlapping the roll-up (those must not count twice) and going past it.
    const minutes = [];
    for (let t = Date.parse("2030-01-08T12:00:00Z"); t < Date.parse("2030-01-16T12:00:00Z"); t += MIN) {
      minutes.push({ sensorId, minute: new Date(t), samples: 4, tempMinC: tempAt(t) - 0.5, tempMaxC: tempAt(t) + 0.5, tempMeanC: tempAt(t), rhMean: 80 });
    }
    for (let i = 0; i < minutes.length; i += 2000) await insertMany(db, readingMinutes, minutes.slice(i, i + 2000), { keep: true });
    const raw = [];
    for (let t = Date.parse("2030-01-16T10:30:00Z"); t <= nowMs; t += 30_000) {
      raw.push({ sensorId, at: new Date(t), tempC: t >= Date.parse("2030-01-16T12:00:00Z") ? 20 : 99, rh: 60 });
    }
    await insertMany(db, readings, raw);
    // Switches: on before the range, a withdrawn off inside it, the real off, on again till now.
    const sw = (at: string, toOn: boolean, withdrawn = false) => ({
      plugId: heaterId,
      at: new Date(at),
      toOn,
      fromOn: !toOn,
      cause: "schedule" as const,
      commandId: randomUUID(),
      withdrawnAt: withdrawn ? new Date(Date.parse(at) + 1000) : null,
    });
    await db.insert(switchEvents).values([
      sw("2030-01-15T10:00:00Z", true),
      sw("2030-01-15T13:00:00Z", false, true),
      sw("2030-01-15T14:00:00Z", false),
      sw("2030-01-16T11:00:00Z", true),
    ]);
    day = await getHouseChart({ siteId, houseId, range: "24h", now });
  });

  it("24 h in 5-minute buckets, ending with the bucket that holds now", () => {
    expect(day.bucketMs).toBe(5 * MIN);
    expect(day.times).toHaveLength(288);
    expect(day.times.at(-1)).toBe(Date.parse("2030-01-16T12:00:00Z"));
    expect(day.times[0]).toBe(Date.parse("2030-01-15T12:05:00Z"));
    expect(day.sensor).toEqual({ id: sensorId, name: "Air" });
  });

  it("averages the roll-up per bucket, and takes raw readings only after its last minute", () => {
    const i = day.times.indexOf(Date.parse("2030-01-16T11:00:00Z"));
    // Minutes 0..4 of the hour: 10.00, 10.10, 10.20, 10.30, 10.40 → mean 10.2; the raw 99s there are ignored.
    expect(day.series.tempC[i]).toBeCloseTo(10.2, 5);
    expect(day.series.tempMinC[i]).toBeCloseTo(9.5, 5);
    expect(day.series.tempMaxC[i]).toBeCloseTo(10.9, 5);
    expect(day.series.rh[i]).toBeCloseTo(80, 5);
    // The last bucket has only raw readings (12:00:00–12:02:30).
    expect(day.series.tempC.at(-1)).toBe(20);
    expect(day.series.rh.at(-1)).toBe(60);
    expect(day.series.tempC.every((v) => v !== null && v < 99)).toBe(true);
  });

  it("shades the heater from the start of the range (on before it), skipping the withdrawn off", () => {
    expect(day.heaters).toEqual([
      {
        id: heaterId,
        name: "Bench heater",
        periods: [
          { from: day.from, until: Date.parse("2030-01-15T14:00:00Z") },
          { from: Date.parse("2030-01-16T11:00:00Z"), until: nowMs },
        ],
      },
    ]);
  });

  it("draws the band in force: the window's band by day, the frost band outside it", () => {
    expect(day.bandPlug).toEqual({ id: heaterId, name: "Bench heater" });
    expect(day.bands).toEqual([
      { from: day.from, until: Date.parse("2030-01-15T18:00:00Z"), lowC: 8, highC: 10, kind: "window" },
      { from: Date.parse("2030-01-15T18:00:00Z"), until: Date.parse("2030-01-16T06:00:00Z"), lowC: 3, highC: 5, kind: "frost" },
      { from: Date.parse("2030-01-16T06:00:00Z"), until: nowMs, lowC: 8, highC: 10, kind: "window" },
    ]);
  });

  it("7 days in 30-minute buckets", async () => {
    const week = await getHouseChart({ siteId, houseId, range: "7d", now });
    expect(week.bucketMs).toBe(30 * MIN);
    expect(week.times).toHaveLength(336);
    expect(week.from).toBe(Date.parse("2030-01-09T12:30:00Z"));
    // 12:30–12:59 on the 9th: minutes 30..59 → 13.0..15.9 °C, mean 14.45.
    expect(week.series.tempC[0]).toBeCloseTo(14.45, 5);
    expect(week.heaters[0]!.periods[0]).toEqual({ from: Date.parse("2030-01-15T10:00:00Z"), until: Date.parse("2030-01-15T14:00:00Z") });
  });

  it("a house without a sensor has nothing to chart", async () => {
    const bare = await getHouseChart({ siteId, houseId: bareHouseId, range: "24h", now });
    expect(bare).toMatchObject({ sensor: null, times: [], bands: [], heaters: [] });
  });
});

describe("GET /api/sites/[siteId]/houses/[houseId]/chart", () => {
  const get = (range: string | null, ids = { siteId, houseId }) =>
    call(chartRoute.GET, {
      path: `/api/sites/${ids.siteId}/houses/${ids.houseId}/chart${range === null ? "" : `?range=${range}`}`,
      params: ids,
      cookie: owner.cookie,
    });

  it("answers 24 h and 7 d for a member", async () => {
    for (const [range, points] of [["24h", 288], ["7d", 336], [null, 288]] as const) {
      const response = await get(range);
      expect(response.status).toBe(200);
      const body = (await response.json()) as HouseChart;
      expect(body.range).toBe(range ?? "24h");
      expect(body.times).toHaveLength(points);
      expect(body.series.tempC).toHaveLength(points);
    }
  });

  it("refuses a range it does not know (400), naming it", async () => {
    const response = await get("1y");
    expect(response.status).toBe(400);
    const body = (await response.json()) as { error: { code: string; message: string; fields: Record<string, string> } };
    expect(body.error.code).toBe("bad_input");
    expect(body.error.fields.range).toMatch(/24h or 7d/);
  });

  it("hides another site's house (404), through one's own site or the other's", async () => {
    expect((await get("24h", { siteId, houseId: otherHouseId })).status).toBe(404);
    expect((await get("24h", { siteId: otherSiteId, houseId: otherHouseId })).status).toBe(404);
  });
});

describe("the live data's in-force fields", () => {
  const now = new Date("2030-01-16T20:00:00Z");

  it("the frost default outside the window, until it opens, with the band that follows", async () => {
    const live = await getSiteLive({ siteId, now });
    const plug = live.plugs.find((p) => p.plugId === heaterId)!;
    expect(plug.inForce).toEqual({
      rule: { kind: "frost", lowC: 3, highC: 5 },
      until: new Date("2030-01-17T06:00:00Z"),
      next: { kind: "window", mode: "band", lowC: 8, highC: 10, scheduleName: "Winter days" },
      guardUntil: null,
    });
  });

  it("an override with who and why, and the guard's wait while it holds", async () => {
    const overrideId = randomUUID();
    await db.insert(overrides).values({
      id: overrideId,
      plugId: heaterId,
      on: true,
      startsAt: new Date("2030-01-16T19:30:00Z"),
      endsAt: new Date("2030-01-16T21:00:00Z"),
      userId: owner.userId,
      reason: "Drying the benches",
    });
    await db
      .insert(plugStates)
      .values({ plugId: heaterId, on: false, guardUntil: new Date("2030-01-16T20:02:00Z"), updatedAt: now })
      .onDuplicateKeyUpdate({ set: { guardUntil: new Date("2030-01-16T20:02:00Z") } });
    try {
      const plug = (await getSiteLive({ siteId, now })).plugs.find((p) => p.plugId === heaterId)!;
      expect(plug.inForce).toEqual({
        rule: { kind: "override", on: true, by: owner.name, reason: "Drying the benches" },
        until: new Date("2030-01-16T21:00:00Z"),
        next: { kind: "frost", lowC: 3, highC: 5 },
        guardUntil: new Date("2030-01-16T20:02:00Z"),
      });
      // Once the guard's instant has passed it is no longer reported.
      const later = (await getSiteLive({ siteId, now: new Date("2030-01-16T20:05:00Z") })).plugs.find((p) => p.plugId === heaterId)!;
      expect(later.inForce?.guardUntil).toBeNull();
    } finally {
      await db.delete(overrides).where(eq(overrides.id, overrideId));
      await db.delete(plugStates).where(eq(plugStates.plugId, heaterId));
    }
  });
});
