// Loads what the controller needs from MariaDB: sites, plugs with their house's
// limits, sensors, schedules and the overrides that are or will be active.
import { and, desc, eq, gt, inArray, isNull, or, sql } from "drizzle-orm";
import type { Database } from "@/db/client";
import { sharedRules, type PlugRules } from "@/lib/control";
import { groupBy } from "@/lib/group-by";
import {
  houses,
  overrides,
  plugs,
  readings,
  scheduleExceptions,
  scheduleWindows,
  schedules,
  sensors,
  sites,
} from "@/db/schema";

export type SiteConfig = { id: string; slug: string; timeZone: string; mainsVoltage: number; continuousLoadPercent: number };
export type PlugConfig = typeof plugs.$inferSelect & { highLimitC: number };
export type SensorConfig = Pick<typeof sensors.$inferSelect, "id" | "siteId" | "houseId" | "deviceId">;
export type ScheduleConfig = {
  id: string;
  plugId: string;
  validFrom: string | null;
  validUntil: string | null;
  windows: {
    id: string;
    recurrence: string;
    startsAt: string;
    durationMin: number;
    mode: "band" | "on" | "off";
    lowC: number | null;
    highC: number | null;
  }[];
  skipDays: string[];
};
export type OverrideConfig = {
  id: string;
  plugId: string;
  on: boolean;
  startsAt: Date;
  endsAt: Date | null;
  untilNextChange: boolean;
  userId: string | null;
};

export type Config = {
  sites: SiteConfig[];
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
  if (siteRows.length === 0) return { sites: [], plugs: [], sensors: [], schedules: [], overrides: [] };
  const siteIds = siteRows.map((s) => s.id);

  const [plugRows, sensorRows] = await Promise.all([
    db
      .select({ plug: plugs, highLimitC: houses.highLimitC })
      .from(plugs)
      .innerJoin(houses, eq(houses.id, plugs.houseId))
      .where(and(inArray(plugs.siteId, siteIds), isNull(plugs.retiredAt))),
    db
      .select({ id: sensors.id, siteId: sensors.siteId, houseId: sensors.houseId, deviceId: sensors.deviceId })
      .from(sensors)
      .where(and(inArray(sensors.siteId, siteIds), isNull(sensors.retiredAt))),
  ]);

  const plugIds = plugRows.map((r) => r.plug.id);
  if (plugIds.length === 0) {
    return { sites: siteRows, plugs: [], sensors: sensorRows, schedules: [], overrides: [] };
  }

  const [scheduleRows, windowRows, skipRows, overrideRows] = await Promise.all([
    db.select().from(schedules).where(inArray(schedules.plugId, plugIds)),
    db
      .select({ window: scheduleWindows })
      .from(scheduleWindows)
      .innerJoin(schedules, eq(schedules.id, scheduleWindows.scheduleId))
      .where(inArray(schedules.plugId, plugIds)),
    db
      .select({ scheduleId: scheduleExceptions.scheduleId, day: scheduleExceptions.day })
      .from(scheduleExceptions)
      .innerJoin(schedules, eq(schedules.id, scheduleExceptions.scheduleId))
      .where(inArray(schedules.plugId, plugIds)),
    db
      .select({
        id: overrides.id,
        plugId: overrides.plugId,
        on: overrides.on,
        startsAt: overrides.startsAt,
        endsAt: overrides.endsAt,
        untilNextChange: overrides.untilNextChange,
        userId: overrides.userId,
      })
      .from(overrides)
      .where(
        and(
          inArray(overrides.plugId, plugIds),
          isNull(overrides.cancelledAt),
          or(isNull(overrides.endsAt), gt(overrides.endsAt, now)),
        ),
      )
      .orderBy(desc(overrides.startsAt)),
  ]);

  const windowsOf = groupBy(windowRows, (w) => w.window.scheduleId);
  const skipDaysOf = groupBy(skipRows, (k) => k.scheduleId);
  return {
    sites: siteRows,
    plugs: plugRows.map((r) => ({ ...r.plug, highLimitC: r.highLimitC })),
    sensors: sensorRows,
    schedules: scheduleRows.map((s) => ({
      id: s.id,
      plugId: s.plugId,
      validFrom: s.validFrom,
      validUntil: s.validUntil,
      windows: (windowsOf.get(s.id) ?? []).map(({ window: w }) => ({
        id: w.id,
        recurrence: w.recurrence,
        startsAt: w.startsAt,
        durationMin: w.durationMin,
        mode: w.mode,
        lowC: w.lowC,
        highC: w.highC,
      })),
      skipDays: (skipDaysOf.get(s.id) ?? []).map((k) => k.day),
    })),
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
    .select({ sensorId: readings.sensorId, tempC: readings.tempC, at: readings.at })
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
