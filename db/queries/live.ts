import "server-only";
import { and, eq, gte, inArray, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { loadPlugStates } from "@/db/plug-states";
import { alerts, plugs, readings, sensorStates, sensors, sites, switchEvents } from "@/db/schema";
import { getControllerStatus, type ControllerStatus } from "./controller-status";
import { getInForceByPlug, type PlugInForce } from "./in-force";

export type SensorLive = {
  sensorId: string;
  houseId: string;
  online: boolean;
  lastSeenAt: Date | null;
  latest: { tempC: number | null; rh: number | null; at: Date } | null;
  last24h: { tempMinC: number | null; tempMaxC: number | null; rhMin: number | null; rhMax: number | null } | null;
};

export type PlugLive = {
  plugId: string;
  houseId: string;
  online: boolean;
  lastSeenAt: Date | null;
  /** The state its last switch took it to (or is taking it to, unconfirmed), why, and since when. */
  on: boolean | null;
  cause: (typeof switchEvents.$inferSelect)["cause"] | null;
  since: Date | null;
  acknowledged: boolean | null;
  /** Why the controller keeps the plug as it is now (can differ from the last switch's cause). */
  presentCause: (typeof switchEvents.$inferSelect)["cause"] | null;
  /**
   * What the plug follows now (override, window, default), until when and what follows;
   * `guardUntil` while the anti-short-cycle guard holds a change back. Null for a plug
   * whose plan could not be worked out (it is then left out rather than guessed).
   */
  inForce: (PlugInForce & { guardUntil: Date | null }) | null;
};

export type SiteLive = {
  at: Date;
  sensors: SensorLive[];
  plugs: PlugLive[];
  openAlerts: { id: number; kind: string; message: string; raisedAt: Date; houseId: string | null; plugId: string | null }[];
  /** Whether a controller serving this site is switching its plugs. */
  controller: ControllerStatus;
};

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/** What is happening in a site now: latest readings with their 24 h range, each plug's state. */
export async function getSiteLive({ siteId, now = new Date() }: { siteId: string; now?: Date }): Promise<SiteLive> {
  const db = getDb();
  const [sensorRows, plugRows, openAlerts, controller, [site]] = await Promise.all([
    db
      .select({ id: sensors.id, houseId: sensors.houseId, online: sensorStates.online, lastSeenAt: sensorStates.lastSeenAt })
      .from(sensors)
      .leftJoin(sensorStates, eq(sensorStates.sensorId, sensors.id))
      .where(and(eq(sensors.siteId, siteId), isNull(sensors.retiredAt))),
    db
      .select({
        id: plugs.id,
        houseId: plugs.houseId,
        outsideWindows: plugs.outsideWindows,
        frostLowC: plugs.frostLowC,
        frostHighC: plugs.frostHighC,
      })
      .from(plugs)
      .where(and(eq(plugs.siteId, siteId), isNull(plugs.retiredAt))),
    db
      .select({
        id: alerts.id,
        kind: alerts.kind,
        message: alerts.message,
        raisedAt: alerts.raisedAt,
        houseId: alerts.houseId,
        plugId: alerts.plugId,
      })
      .from(alerts)
      .where(and(eq(alerts.siteId, siteId), isNull(alerts.clearedAt)))
      .orderBy(sql`${alerts.raisedAt} DESC`)
      .limit(50),
    getControllerStatus({ siteId, now }),
    db.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId)).limit(1),
  ]);

  const sensorIds = sensorRows.map((s) => s.id);
  const plugIds = plugRows.map((p) => p.id);
  const dayAgo = new Date(now.getTime() - 24 * 3600_000);

  const ranges = sensorIds.length
    ? await db
        .select({
          sensorId: readings.sensorId,
          lastAt: sql<Date>`MAX(${readings.at})`,
          tempMinC: sql<number | null>`MIN(${readings.tempC})`,
          tempMaxC: sql<number | null>`MAX(${readings.tempC})`,
          rhMin: sql<number | null>`MIN(${readings.rh})`,
          rhMax: sql<number | null>`MAX(${readings.rh})`,
        })
        .from(readings)
        .where(and(inArray(readings.sensorId, sensorIds), gte(readings.at, dayAgo)))
        .groupBy(readings.sensorId)
    : [];
  const latestRows = ranges.length
    ? await db
        .select({ sensorId: readings.sensorId, tempC: readings.tempC, rh: readings.rh, at: readings.at })
        .from(readings)
        .where(
          sql`(${readings.sensorId}, ${readings.at}) IN (${sql.join(
            ranges.map((r) => sql`(${r.sensorId}, ${new Date(r.lastAt)})`),
            sql`, `,
          )})`,
        )
    : [];

  const [states, inForce] = await Promise.all([
    loadPlugStates(db, plugIds),
    site ? getInForceByPlug({ db, plugs: plugRows, timeZone: site.timeZone, now }) : new Map<string, PlugInForce>(),
  ]);
  // The causes of the switches the stored states point at: one indexed lookup each.
  const commandIds = [...states.values()].flatMap((st) => [st.switchCommandId, st.pendingCommandId]).filter((id): id is string => id !== null);
  const switchCauses = commandIds.length
    ? new Map(
        (await db.select({ commandId: switchEvents.commandId, cause: switchEvents.cause }).from(switchEvents).where(inArray(switchEvents.commandId, commandIds))).map(
          (row) => [row.commandId, row.cause],
        ),
      )
    : new Map<string, PlugLive["cause"]>();

  return {
    at: now,
    sensors: sensorRows.map((s) => {
      const range = ranges.find((r) => r.sensorId === s.id);
      const latest = latestRows.find((r) => r.sensorId === s.id);
      return {
        sensorId: s.id,
        houseId: s.houseId,
        online: s.online ?? false,
        lastSeenAt: s.lastSeenAt,
        latest: latest ? { tempC: latest.tempC, rh: latest.rh, at: latest.at } : null,
        last24h: range
          ? { tempMinC: num(range.tempMinC), tempMaxC: num(range.tempMaxC), rhMin: num(range.rhMin), rhMax: num(range.rhMax) }
          : null,
      };
    }),
    plugs: plugRows.map((p): PlugLive => {
      const st = states.get(p.id);
      const pending = st?.pendingCommandId && st.pendingOn !== null ? st : null;
      const plan = inForce.get(p.id);
      const base = {
        plugId: p.id,
        houseId: p.houseId,
        online: st?.online ?? false,
        lastSeenAt: st?.lastSeenAt ?? null,
        presentCause: st?.presentCause ?? null,
        inForce: plan ? { ...plan, guardUntil: st?.guardUntil && st.guardUntil > now ? st.guardUntil : null } : null,
      };
      // A switch on its way shows as what it is doing until the plug confirms it.
      if (pending) {
        return { ...base, on: pending.pendingOn, cause: switchCauses.get(pending.pendingCommandId!) ?? null, since: pending.pendingSince, acknowledged: false };
      }
      if (!st || st.on === null) return { ...base, on: null, cause: null, since: null, acknowledged: null };
      return { ...base, on: st.on, cause: st.switchCommandId ? (switchCauses.get(st.switchCommandId) ?? null) : null, since: st.since, acknowledged: true };
    }),
    openAlerts,
    controller,
  };
}
