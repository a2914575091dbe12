import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import type mysql from "mysql2/promise";
import { getDb, getPool } from "@/db/client";
import { houses, plugs, sensors, sites } from "@/db/schema";
import type { DegreeDayMethod } from "@/lib/domain";
import { findTrend, periodFigures, type PeriodUse, type Trend } from "@/lib/energy/degree-day-trend";
import {
  DEGREE_DAY_UNITS,
  dayTemperatures,
  dayWindows,
  degreeDays,
  expectedKwhPerKelvinDay,
  insideOutsideDegreeDays,
  type DayAggregate,
  type DayTemperatures,
  type DayWindow,
} from "@/lib/energy/degree-days";
import { heatLossCoefficients, HouseShapeError } from "@/lib/thermal/heat-loss";
import { getEnergyReport } from "./energy";

export type DegreeDayRow = {
  day: string;
  /** Outside lowest/highest/mean; null when the outside sensor read too little of the day. */
  outside: DayTemperatures | null;
  /** Mean of the house's inside sensors; null when they read too little of the day. */
  insideMeanC: number | null;
  /** In the site's method and its unit (°C·day or °F·day). */
  degreeDays: number | null;
  /** Mean inside less mean outside where positive, K·day. */
  insideOutside: number | null;
  /** The house's heaters' kWh that day (metered where a plug meters, rated otherwise); null without a heater. */
  heatingKwh: number | null;
};

export type DegreeDayHouse = {
  id: string;
  name: string;
  /** The outside sensor this house's degree-days come from. */
  outsideSensor: { id: string; name: string; onThisHouse: boolean } | null;
  insideSensors: number;
  heaters: number;
  /** kWh per K·day the heat-loss sums expect of its glazing and size; null when its shape cannot be worked out. */
  expectedKwhPerKelvinDay: number | null;
  /** The whole range's heating kWh over its inside–outside K·days (days with both). */
  kwhPerKelvinDay: number | null;
  days: DegreeDayRow[];
  weeks: PeriodUse[];
  months: PeriodUse[];
  trend: Trend;
};

export type DegreeDayReport = {
  fromDay: string;
  toDay: string;
  zone: string;
  method: DegreeDayMethod;
  unit: string;
  /** The site's working outside sensors; degree-days need at least one. */
  outsideSensors: { id: string; name: string; houseId: string }[];
  houses: DegreeDayHouse[];
};

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/**
 * Per house and local day from `fromDay` to `toDay`: outside and inside temperatures,
 * degree-days in the site's method, the inside–outside figure and the heaters' kWh.
 *
 * The outside temperature of a house comes from an outside sensor mounted on it, or
 * else from the site's first working outside sensor by name. Inside is every inside
 * sensor of the house (retired ones too: their readings were the house's). Days are
 * cut in SQL at the local-day starts worked out here, so no zone tables are needed.
 */
export async function getDegreeDayReport({ siteId, fromDay, toDay }: { siteId: string; fromDay: string; toDay: string }): Promise<DegreeDayReport> {
  const db = getDb();
  const [[site], houseRows, sensorRows, heaterRows] = await Promise.all([
    db.select({ zone: sites.timeZone, method: sites.degreeDayMethod }).from(sites).where(eq(sites.id, siteId)),
    db.select().from(houses).where(eq(houses.siteId, siteId)).orderBy(asc(houses.name)),
    db
      .select({ id: sensors.id, name: sensors.name, houseId: sensors.houseId, placement: sensors.placement, retiredAt: sensors.retiredAt })
      .from(sensors)
      .where(eq(sensors.siteId, siteId))
      .orderBy(asc(sensors.name)),
    db
      .select({ id: plugs.id, houseId: plugs.houseId })
      .from(plugs)
      .where(and(eq(plugs.siteId, siteId), eq(plugs.applianceKind, "heater"), isNull(plugs.retiredAt))),
  ]);
  if (!site) throw new Error(`site ${siteId} not found`);
  const windows = dayWindows(fromDay, toDay, site.zone);

  const outsideSensors = sensorRows.filter((s) => s.placement === "outside" && s.retiredAt === null);
  const insideSensors = sensorRows.filter((s) => s.placement === "inside");
  const outsideOf = (houseId: string) => {
    const own = outsideSensors.find((s) => s.houseId === houseId);
    const chosen = own ?? outsideSensors[0];
    return chosen ? { id: chosen.id, name: chosen.name, onThisHouse: Boolean(own) } : null;
  };
  const usedOutside = [...new Set(houseRows.map((h) => outsideOf(h.id)?.id).filter((id): id is string => Boolean(id)))];

  const pool = getPool();
  const [outsideDays, insideDays, energy] = await Promise.all([
    aggregateByDay(pool, { siteId, sensorIds: usedOutside, by: "sensor", windows }),
    aggregateByDay(pool, { siteId, sensorIds: insideSensors.map((s) => s.id), by: "house", windows }),
    getEnergyReport({ siteId, fromDay, toDay, bucket: "day", applianceKinds: ["heater"] }),
  ]);
  const kwhByDay = new Map(energy.series.map((s) => [s.key, s.byHouse]));

  const reportHouses = houseRows.map((house): DegreeDayHouse => {
    const outsideSensor = outsideOf(house.id);
    const heaters = heaterRows.filter((p) => p.houseId === house.id).length;
    const days = windows.map((w): DegreeDayRow => {
      const outside = outsideSensor ? dayTemperatures(outsideDays.get(`${outsideSensor.id}|${w.day}`), w) : null;
      const inside = dayTemperatures(insideDays.get(`${house.id}|${w.day}`), w);
      return {
        day: w.day,
        outside,
        insideMeanC: inside?.meanC ?? null,
        degreeDays: outside ? degreeDays(site.method, outside) : null,
        insideOutside: outside && inside ? insideOutsideDegreeDays(inside.meanC, outside.meanC) : null,
        // The report's costed kWh: metered where the meter was heard, rated elsewhere.
        heatingKwh: heaters > 0 ? (kwhByDay.get(w.day)?.[house.id]?.costedKwh ?? 0) : null,
      };
    });
    const use = days.map((d) => ({ day: d.day, kwh: d.heatingKwh, degreeDays: d.degreeDays }));
    const weeks = periodFigures(use, "week", site.method);
    const both = days.filter((d) => d.heatingKwh !== null && d.insideOutside !== null);
    const kelvinDays = both.reduce((s, d) => s + d.insideOutside!, 0);
    return {
      id: house.id,
      name: house.name,
      outsideSensor,
      insideSensors: insideSensors.filter((s) => s.houseId === house.id && s.retiredAt === null).length,
      heaters,
      expectedKwhPerKelvinDay: expectedOf(house),
      kwhPerKelvinDay: kelvinDays > 0 ? both.reduce((s, d) => s + d.heatingKwh!, 0) / kelvinDays : null,
      days,
      weeks,
      months: periodFigures(use, "month", site.method),
      trend: findTrend(weeks),
    };
  });

  return {
    fromDay,
    toDay,
    zone: site.zone,
    method: site.method,
    unit: DEGREE_DAY_UNITS[site.method],
    outsideSensors: outsideSensors.map(({ id, name, houseId }) => ({ id, name, houseId })),
    houses: reportHouses,
  };
}

function expectedOf(house: typeof houses.$inferSelect): number | null {
  try {
    const { totalWK } = heatLossCoefficients({
      kind: house.kind,
      lengthM: Number(house.lengthM),
      widthM: Number(house.widthM),
      eaveHeightM: Number(house.eaveHeightM),
      ridgeHeightM: Number(house.ridgeHeightM),
      glazing: house.glazing,
      airChangesPerHour: Number(house.airChangesPerHour),
    });
    return expectedKwhPerKelvinDay(totalWK);
  } catch (error) {
    if (error instanceof HouseShapeError) return null;
    throw error;
  }
}

/**
 * Per-minute rows summed into local days, keyed `${sensor or house id}|${day}`: minutes
 * with a reading, lowest, highest and the mean of the minutes' means. INTERVAL() finds
 * each minute's day among the day starts (a binary search), so one pass over the
 * primary key (sensor_id, minute) serves the whole range.
 */
async function aggregateByDay(
  pool: mysql.Pool,
  { siteId, sensorIds, by, windows }: { siteId: string; sensorIds: string[]; by: "sensor" | "house"; windows: DayWindow[] },
): Promise<Map<string, DayAggregate>> {
  const result = new Map<string, DayAggregate>();
  if (sensorIds.length === 0 || windows.length === 0) return result;
  const starts = windows.map((w) => Math.round(w.startMs / 1000));
  const key = by === "sensor" ? "rm.sensor_id" : "s.house_id";
  const [rows] = await pool.query(
    `SELECT ${key} AS k,
            INTERVAL(TIMESTAMPDIFF(SECOND, '1970-01-01 00:00:00', rm.minute), ${starts.map(() => "?").join(", ")}) AS d,
            COUNT(DISTINCT rm.minute) AS n, MIN(rm.temp_min_c) AS lo, MAX(rm.temp_max_c) AS hi, AVG(rm.temp_mean_c) AS mean
       FROM reading_minutes rm
       JOIN sensors s ON s.id = rm.sensor_id AND s.site_id = ?
      WHERE rm.sensor_id IN (?) AND rm.minute >= ? AND rm.minute < ? AND rm.temp_mean_c IS NOT NULL
      GROUP BY k, d`,
    [...starts, siteId, sensorIds, new Date(windows[0]!.startMs), new Date(windows.at(-1)!.endMs)],
  );
  for (const r of rows as { k: string; d: number; n: number; lo: string | null; hi: string | null; mean: string | null }[]) {
    const window = windows[Number(r.d) - 1];
    if (!window) continue;
    result.set(`${r.k}|${window.day}`, { minutesWithData: Number(r.n), minC: num(r.lo), maxC: num(r.hi), meanC: num(r.mean) });
  }
  return result;
}
