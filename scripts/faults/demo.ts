// What the process-level scenarios arrange on the demo site, straight in the database
// and over MQTT, so that the moment a plug should switch is known to the second: a
// window opening on an on/off plug, a manual override, a house's alert rules, and the
// controller woken to take them in at once.
import { randomUUID } from "node:crypto";
import { and, eq, gte, inArray, lte } from "drizzle-orm";
import mqtt, { type MqttClient } from "mqtt";
import { connect, type Database } from "../../db/client";
import { DEMO_MEMBERS, DEMO_SITE } from "../../db/seed";
import { alerts, houseAlertRules, houses, overrides, plugs, scheduleWindows, schedules, sensors, sites, switchEvents } from "../../db/schema";
import type { LogRow } from "./accounting";
import { DEFAULT_ALERT_RULES } from "../../lib/alerts/rules";
import { WEBAPP_USERNAME, deviceUsername } from "../../lib/mqtt/credentials";
import { wakeTopic, type WakePayload } from "../../lib/mqtt/topics";
import type { AlertKind } from "../../lib/domain";

export const SITE = DEMO_SITE.slug;

export function demoOwner() {
  return DEMO_MEMBERS.find((m) => m.role === "owner")!;
}

/** Runs `work` on a connection of its own, closed after (a pool would outlive a killed server badly). */
export async function withDatabase<T>(url: string, work: (db: Database) => Promise<T>): Promise<T> {
  const { db, pool } = connect(url);
  try {
    return await work(db);
  } finally {
    await pool.end().catch(() => undefined);
  }
}

export type DemoPlug = { id: string; houseId: string; deviceId: string; leaseS: number; sensorId: string | null };
export type DemoSite = {
  id: string;
  timeZone: string;
  plug(deviceId: string): DemoPlug;
  houseHighLimitC(houseId: string): number;
  sensorDevice(sensorId: string): string;
};

export async function loadDemoSite(url: string): Promise<DemoSite> {
  return withDatabase(url, async (db) => {
    const [site] = await db.select().from(sites).where(eq(sites.slug, SITE));
    if (!site) throw new Error(`the demo site ${SITE} is not in the database`);
    const plugRows = await db.select().from(plugs).where(eq(plugs.siteId, site.id));
    const houseRows = await db.select().from(houses).where(eq(houses.siteId, site.id));
    const sensorRows = await db.select().from(sensors).where(eq(sensors.siteId, site.id));
    return {
      id: site.id,
      timeZone: site.timeZone,
      plug(deviceId) {
        const p = plugRows.find((row) => row.deviceId === deviceId);
        if (!p) throw new Error(`the demo site has no plug ${deviceId}`);
        return { id: p.id, houseId: p.houseId, deviceId: p.deviceId, leaseS: p.leaseS, sensorId: p.sensorId };
      },
      houseHighLimitC: (houseId) => Number(houseRows.find((h) => h.id === houseId)?.highLimitC),
      sensorDevice: (sensorId) => sensorRows.find((s) => s.id === sensorId)!.deviceId,
    };
  });
}

/** "HH:MM:SS" of an instant on the wall clock of a zone. */
export function wallClock(ms: number, timeZone: string) {
  const parts = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23" }).formatToParts(new Date(ms));
  const part = (type: string) => parts.find((p) => p.type === type)!.value;
  return `${part("hour")}:${part("minute")}:${part("second")}`;
}

/**
 * Gives an on/off plug one daily window, opening at `opensAtMs` (to the second) for
 * `minutes`, in place of its windows; its minimum on/off times set to `guardS`.
 */
export async function setOnWindow(url: string, site: DemoSite, plug: DemoPlug, opensAtMs: number, minutes: number, guardS = 10) {
  await withDatabase(url, (db) =>
    db.transaction(async (t) => {
      const owned = await t.select({ id: schedules.id }).from(schedules).where(eq(schedules.plugId, plug.id));
      let scheduleId = owned[0]?.id;
      if (owned.length) await t.delete(scheduleWindows).where(inArray(scheduleWindows.scheduleId, owned.map((s) => s.id)));
      if (!scheduleId) {
        scheduleId = randomUUID();
        await t.insert(schedules).values({ id: scheduleId, plugId: plug.id, name: "Fault suite" });
      }
      await t.insert(scheduleWindows).values({
        id: randomUUID(),
        scheduleId,
        recurrence: "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU",
        startsAt: wallClock(opensAtMs, site.timeZone),
        durationMin: minutes,
        mode: "on",
      });
    }),
  );
  await setGuard(url, plug, guardS);
}

/** A plug's minimum on and off times (the anti-short-cycle guard), so a scenario's switches are not held back long. */
export async function setGuard(url: string, plug: DemoPlug, seconds: number) {
  await withDatabase(url, (db) => db.update(plugs).set({ minOnS: seconds, minOffS: seconds }).where(eq(plugs.id, plug.id)));
}

export async function addOverride(url: string, plug: DemoPlug, on: boolean, minutes: number): Promise<string> {
  const id = randomUUID();
  const now = Date.now();
  await withDatabase(url, (db) =>
    db.insert(overrides).values({ id, plugId: plug.id, on, startsAt: new Date(now), endsAt: new Date(now + minutes * 60_000), reason: "Fault suite" }),
  );
  return id;
}

export async function cancelOverride(url: string, id: string) {
  await withDatabase(url, (db) => db.update(overrides).set({ cancelledAt: new Date() }).where(eq(overrides.id, id)));
}

/** A house's "plug offline after" rule, in minutes (the others stay at their defaults). */
export async function setPlugOfflineAfter(url: string, houseId: string, minutes: number) {
  const rules = { ...DEFAULT_ALERT_RULES, plugOffline: { enabled: true, afterMin: minutes } };
  await withDatabase(url, (db) => db.insert(houseAlertRules).values({ houseId, rules }).onDuplicateKeyUpdate({ set: { rules } }));
}

export async function alertsRaised(url: string, plugId: string, kind: AlertKind, sinceMs: number) {
  return withDatabase(url, (db) =>
    db
      .select({ raisedAt: alerts.raisedAt, clearedAt: alerts.clearedAt })
      .from(alerts)
      .where(and(eq(alerts.plugId, plugId), eq(alerts.kind, kind), gte(alerts.raisedAt, new Date(sinceMs)))),
  );
}

/** Connects as anyone the broker knows; rejects after `timeoutMs` without retrying. */
export async function mqttConnect(url: string, username: string, password: string, timeoutMs: number): Promise<MqttClient> {
  const client = mqtt.connect(url, { protocolVersion: 4, username, password, clientId: `cloche-faults-${randomUUID().slice(0, 8)}`, reconnectPeriod: 0, connectTimeout: timeoutMs });
  try {
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no CONNACK within ${timeoutMs} ms`)), timeoutMs);
      client.once("connect", () => (clearTimeout(timer), resolve()));
      client.once("error", (error) => (clearTimeout(timer), reject(error)));
      client.once("close", () => (clearTimeout(timer), reject(new Error("connection closed before CONNACK"))));
    });
    return client;
  } catch (error) {
    client.end(true);
    throw error;
  }
}

export function sensorUsername(device: string) {
  return deviceUsername(SITE, "sensor", device);
}

/** The web app's wake-up, as a handler would publish it after its change. */
export async function wakeSite(mqttUrl: string, env: NodeJS.ProcessEnv, payload: WakePayload) {
  const client = await mqttConnect(mqttUrl, WEBAPP_USERNAME, env.CLOCHE_MQTT_WEBAPP_SECRET ?? "", 10_000);
  try {
    await client.publishAsync(wakeTopic(SITE), JSON.stringify(payload), { qos: 1 });
  } finally {
    await client.endAsync();
  }
}

/** The switch log of every plug between two instants, in the order it was written. */
export async function readSwitchLog(databaseUrl: string, fromMs: number, toMs: number): Promise<LogRow[]> {
  return withDatabase(databaseUrl, async (db) => {
    const plugRows = await db.select({ id: plugs.id, deviceId: plugs.deviceId }).from(plugs);
    const device = new Map(plugRows.map((p) => [p.id, p.deviceId]));
    const rows = await db
      .select()
      .from(switchEvents)
      .where(and(gte(switchEvents.at, new Date(fromMs)), lte(switchEvents.at, new Date(toMs)), inArray(switchEvents.plugId, [...device.keys()])))
      .orderBy(switchEvents.id);
    return rows.map((r) => ({
      id: r.id,
      device: device.get(r.plugId)!,
      commandId: r.commandId,
      fromOn: r.fromOn,
      toOn: r.toOn,
      cause: r.cause,
      atMs: r.at.getTime(),
      ackAtMs: r.ackAt?.getTime() ?? null,
      withdrawn: r.withdrawnAt !== null,
    }));
  });
}
