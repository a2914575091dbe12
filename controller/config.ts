// Loads what the controller needs from MariaDB: sites, houses with their alert rules,
// plugs with their house's limits, sensors, schedules and the overrides that are or
// will be active.
import { and, eq, gt, inArray, isNull, sql } from "drizzle-orm";
import type { Database } from "@/db/client";
import { sharedRules, type PlugRules } from "@/lib/control";
import { houseAlertRules, houses, plugs, readings, sensors, sites } from "@/db/schema";
import { storedAlertRules, type AlertRules } from "@/lib/alerts/rules";
import { loadPlugSchedules, type OverrideConfig, type ScheduleConfig } from "@/db/plug-schedules";

export type SiteConfig = { id: string; slug: string; timeZone: string; mainsVoltage: number; continuousLoadPercent: number };
export type PlugConfig = typeof plugs.$inferSelect & { highLimitC: number };
export type SensorConfig = Pick<typeof sensors.$inferSelect, "id" | "siteId" | "houseId" | "deviceId" | "name" | "placement">;
/** A house as the alert rules need it: its name, frost limit and rules (the defaults when it has none stored). */
export type HouseConfig = { id: string; siteId: string; name: string; lowLimitC: number; alertRules: AlertRules };
export type { OverrideConfig, ScheduleConfig };

export type Config = {
  sites: SiteConfig[];
  houses: HouseConfig[];
  plugs: PlugConfig[];
  sensors: SensorConfig[];
  schedules: ScheduleConfig[];
  overrides: OverrideConfig[];
};

export async function loadConfig(db: Database, now: Date, siteSlugs?: string[]): Promise<Config> {
  const siteRows = await db
    .select({
      id: sites.id,
      slug: sites.slug,
      timeZone: sites.timeZone,
      mainsVoltage: sites.mainsVoltage,
      continuousLoadPercent: sites.continuousLoadPercent,
    })
    .from(sites)
    .where(siteSlugs?.length ? inArray(sites.slug, siteSlugs) : undefined);
  if (siteRows.length === 0) return { sites: [], houses: [], plugs: [], sensors: [], schedules: [], overrides: [] };
  const siteIds = siteRows.map((s) => s.id);

  const [houseRows, plugRows, sensorRows] = await Promise.all([
    db
      .select({ id: houses.id, siteId: houses.siteId, name: houses.name, lowLimitC: houses.lowLimitC, rules: houseAlertRules.rules })
      .from(houses)
      .leftJoin(houseAlertRules, eq(houseAlertRules.houseId, houses.id))
      .where(inArray(houses.siteId, siteIds)),
    db
      .select({ plug: plugs, highLimitC: houses.highLimitC })
      .from(plugs)
      .innerJoin(houses, eq(houses.id, plugs.houseId))
      .where(and(inArray(plugs.siteId, siteIds), isNull(plugs.retiredAt))),
    db
      .select({ id: sensors.id, siteId: sensors.siteId, houseId: sensors.houseId, deviceId: sensors.deviceId, name: sensors.name, placement: sensors.placement })
      .from(sensors)
      .where(and(inArray(sensors.siteId, siteIds), isNull(sensors.retiredAt))),
  ]);

  const houseConfigs = houseRows.map(({ rules, ...house }) => ({ ...house, alertRules: storedAlertRules(rules) }));
  const plugIds = plugRows.map((r) => r.plug.id);
  if (plugIds.length === 0) {
    return { sites: siteRows, houses: houseConfigs, plugs: [], sensors: sensorRows, schedules: [], overrides: [] };
  }

  const { schedules: plugSchedules, overrides: overrideRows } = await loadPlugSchedules(db, plugIds, now);
  return {
    sites: siteRows,
    houses: houseConfigs,
    plugs: plugRows.map((r) => ({ ...r.plug, highLimitC: r.highLimitC })),
    sensors: sensorRows,
    schedules: plugSchedules,
    overrides: overrideRows,
  };
}

/** The latest reading of each sensor within the last day, so a restart does not look like a quiet sensor. */
export async function loadLatestReadings(db: Database, sensorIds: string[], now: Date) {
  if (sensorIds.length === 0) return [];
  const since = new Date(now.getTime() - 24 * 3600_000);
  const latest = db
    .select({ sensorId: readings.sensorId, at: sql<Date>`MAX(${readings.at})`.as("latest_at") })
    .from(readings)
    .where(and(inArray(readings.sensorId, sensorIds), gt(readings.at, since)))
    .groupBy(readings.sensorId)
    .as("latest");
  return db
    .select({ sensorId: readings.sensorId, tempC: readings.tempC, rh: readings.rh, battery: readings.battery, at: readings.at })
    .from(readings)
    .innerJoin(latest, and(eq(latest.sensorId, readings.sensorId), eq(latest.at, readings.at)));
}

/** A plug's settings with its house's limit and its site's voltage, as the decision takes them. */
export function rulesOf(plug: PlugConfig, site: SiteConfig): PlugRules {
  return sharedRules({
    applianceKind: plug.applianceKind,
    applianceWatts: plug.applianceWatts,
    ratedCurrentA: plug.ratedCurrentA,
    mainsVoltage: site.mainsVoltage,
    continuousLoadPercent: site.continuousLoadPercent,
    highLimitC: plug.highLimitC,
    failsafe: plug.failsafe,
    failsafeDutyPercent: plug.failsafeDutyPercent,
    failsafeDutyPeriodS: plug.failsafeDutyPeriodS,
    staleAfterS: plug.staleAfterS,
    outsideWindows: plug.outsideWindows,
    frostLowC: plug.frostLowC,
    frostHighC: plug.frostHighC,
    minOnS: plug.minOnS,
    minOffS: plug.minOffS,
  });
}
