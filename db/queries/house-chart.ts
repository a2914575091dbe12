import "server-only";
import { and, asc, desc, eq, gte, isNull, lt, max, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { loadPlugSchedules } from "@/db/plug-schedules";
import { plugs, readingMinutes, readings, sensors, sites, switchEvents } from "@/db/schema";
import { planSegments } from "@/lib/control/plan";
import {
  CHART_RANGES,
  bandSteps,
  bucketStarts,
  onPeriods,
  placeOnGrid,
  type BandStep,
  type BucketRow,
  type ChartRange,
  type ChartSeries,
  type Period,
} from "@/lib/house-chart";
import type { PlanPlug } from "./in-force";

export type HouseChart = {
  range: ChartRange;
  from: number;
  until: number;
  bucketMs: number;
  /** The sensor charted; null when the house has none (then there is nothing to chart). */
  sensor: { id: string; name: string } | null;
  /** Bucket starts (ms), one per point of each series. */
  times: number[];
  series: ChartSeries;
  /** The plug whose band is drawn (the heater that follows the sensor), and its band over time. */
  bandPlug: { id: string; name: string } | null;
  bands: BandStep[];
  /** Each heater's on-periods in the range. */
  heaters: { id: string; name: string; periods: Period[] }[];
};

/** Seconds since the epoch of a DATETIME, in SQL, with no session time zone involved. */
const epochSeconds = (column: unknown) => sql`TIMESTAMPDIFF(SECOND, '1970-01-01 00:00:00', ${column})`;

/**
 * Temperature and humidity of a house over 24 hours or 7 days, averaged server-side
 * into buckets (5 min / 30 min), with the band in force and the heaters' on-periods.
 * The per-minute roll-up (reading_minutes, by its primary key) holds all but the
 * latest minutes; raw readings (readings_sensor_at_idx) fill in after its last minute.
 */
export async function getHouseChart({
  siteId,
  houseId,
  range,
  now = new Date(),
}: {
  siteId: string;
  houseId: string;
  range: ChartRange;
  now?: Date;
}): Promise<HouseChart> {
  const db = getDb();
  const { bucketMs } = CHART_RANGES[range];
  const times = bucketStarts(range, now.getTime());
  const from = new Date(times[0]!);
  const until = now;

  const [sensorRows, plugRows, [site]] = await Promise.all([
    db
      .select({ id: sensors.id, name: sensors.name })
      .from(sensors)
      // An outside sensor measures the outside air, not the house: never charted as its temperature.
      .where(and(eq(sensors.siteId, siteId), eq(sensors.houseId, houseId), eq(sensors.placement, "inside"), isNull(sensors.retiredAt)))
      .orderBy(asc(sensors.name)),
    db
      .select({
        id: plugs.id,
        name: plugs.name,
        applianceKind: plugs.applianceKind,
        sensorId: plugs.sensorId,
        outsideWindows: plugs.outsideWindows,
        frostLowC: plugs.frostLowC,
        frostHighC: plugs.frostHighC,
      })
      .from(plugs)
      .where(and(eq(plugs.siteId, siteId), eq(plugs.houseId, houseId), isNull(plugs.retiredAt)))
      .orderBy(asc(plugs.name)),
    db.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId)).limit(1),
  ]);

  const empty: ChartSeries = { tempC: [], tempMinC: [], tempMaxC: [], rh: [] };
  const base = { range, from: from.getTime(), until: until.getTime(), bucketMs };
  // The sensor most of the house's plugs follow; the first by name when none does.
  const followers = (id: string) => plugRows.filter((p) => p.sensorId === id).length;
  const sensor = [...sensorRows].sort((a, b) => followers(b.id) - followers(a.id))[0];
  if (!sensor || !site) return { ...base, sensor: null, times: [], series: empty, bandPlug: null, bands: [], heaters: [] };

  const heaters = plugRows.filter((p) => p.applianceKind === "heater");
  const bandPlug = heaters.find((p) => p.sensorId === sensor.id) ?? plugRows.find((p) => p.sensorId === sensor.id) ?? null;

  const [series, bands, heaterPeriods] = await Promise.all([
    bucketedReadings(sensor.id, from, until, bucketMs).then((rows) => placeOnGrid(times, rows)),
    bandPlug ? bandOf(bandPlug, site.timeZone, from, until) : Promise.resolve([]),
    Promise.all(heaters.map(async (h) => ({ id: h.id, name: h.name, periods: await periodsOf(h.id, from, until) }))),
  ]);

  return {
    ...base,
    sensor,
    times,
    series,
    bandPlug: bandPlug ? { id: bandPlug.id, name: bandPlug.name } : null,
    bands,
    heaters: heaterPeriods,
  };
}

async function bucketedReadings(sensorId: string, from: Date, until: Date, bucketMs: number): Promise<BucketRow[]> {
  const db = getDb();
  const bucketS = bucketMs / 1000;
  const minuteBucket = sql<number>`FLOOR(${epochSeconds(readingMinutes.minute)} / ${bucketS}) * ${bucketS}`;
  const rolled = await db
    .select({
      bucketS: minuteBucket,
      samples: sql<number>`SUM(${readingMinutes.samples})`,
      tempMeanC: sql<number | null>`SUM(${readingMinutes.tempMeanC} * ${readingMinutes.samples}) / NULLIF(SUM(CASE WHEN ${readingMinutes.tempMeanC} IS NULL THEN 0 ELSE ${readingMinutes.samples} END), 0)`,
      tempMinC: sql<number | null>`MIN(${readingMinutes.tempMinC})`,
      tempMaxC: sql<number | null>`MAX(${readingMinutes.tempMaxC})`,
      rhMean: sql<number | null>`SUM(${readingMinutes.rhMean} * ${readingMinutes.samples}) / NULLIF(SUM(CASE WHEN ${readingMinutes.rhMean} IS NULL THEN 0 ELSE ${readingMinutes.samples} END), 0)`,
      lastMinute: max(readingMinutes.minute),
    })
    .from(readingMinutes)
    .where(and(eq(readingMinutes.sensorId, sensorId), gte(readingMinutes.minute, from), lt(readingMinutes.minute, until)))
    .groupBy(minuteBucket);

  // Raw readings only after the last summarised minute, so none is counted twice.
  const lastRolled = rolled.reduce((latest, r) => Math.max(latest, r.lastMinute ? new Date(r.lastMinute).getTime() : 0), 0);
  const rawFrom = lastRolled ? new Date(Math.max(from.getTime(), lastRolled + 60_000)) : from;
  const rawBucket = sql<number>`FLOOR(${epochSeconds(readings.at)} / ${bucketS}) * ${bucketS}`;
  const raw = await db
    .select({
      bucketS: rawBucket,
      samples: sql<number>`COUNT(*)`,
      tempMeanC: sql<number | null>`AVG(${readings.tempC})`,
      tempMinC: sql<number | null>`MIN(${readings.tempC})`,
      tempMaxC: sql<number | null>`MAX(${readings.tempC})`,
      rhMean: sql<number | null>`AVG(${readings.rh})`,
    })
    .from(readings)
    .where(and(eq(readings.sensorId, sensorId), gte(readings.at, rawFrom), lt(readings.at, until)))
    .groupBy(rawBucket);

  const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  return [...rolled, ...raw].map((r) => ({
    bucketMs: Number(r.bucketS) * 1000,
    samples: Number(r.samples),
    tempMeanC: num(r.tempMeanC),
    tempMinC: num(r.tempMinC),
    tempMaxC: num(r.tempMaxC),
    rhMean: num(r.rhMean),
  }));
}

/**
 * The band the plug followed over the range, from its schedules as they stand now (a
 * schedule changed since draws its new band over the past) and the overrides not
 * cancelled that reach into the range.
 */
async function bandOf(plug: PlanPlug, timeZone: string, from: Date, until: Date): Promise<BandStep[]> {
  const loaded = await loadPlugSchedules(getDb(), [plug.id], from);
  const segments = planSegments(
    { schedules: loaded.schedules, timeZone, outsideWindows: plug.outsideWindows, frostLowC: plug.frostLowC, frostHighC: plug.frostHighC, overrides: loaded.overrides },
    from,
    until,
  );
  return bandSteps(segments);
}

/** A plug's on-periods: its kept switches in the range and the last one before it (switch_events_plug_at_idx). */
async function periodsOf(plugId: string, from: Date, until: Date): Promise<Period[]> {
  const db = getDb();
  const columns = { at: switchEvents.at, toOn: switchEvents.toOn, withdrawnAt: switchEvents.withdrawnAt };
  const [before, inside] = await Promise.all([
    db
      .select(columns)
      .from(switchEvents)
      .where(and(eq(switchEvents.plugId, plugId), lt(switchEvents.at, from), isNull(switchEvents.withdrawnAt)))
      .orderBy(desc(switchEvents.at))
      .limit(1),
    db
      .select(columns)
      .from(switchEvents)
      .where(and(eq(switchEvents.plugId, plugId), gte(switchEvents.at, from), lt(switchEvents.at, until)))
      .orderBy(asc(switchEvents.at)),
  ]);
  return onPeriods(before[0] ?? null, inside, from.getTime(), until.getTime());
}

