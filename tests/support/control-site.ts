// A small site of its own for the controller tests: one house with a heater (on a
// band that covers the whole day), its sensor, and a light without a schedule.
import { randomBytes, randomUUID } from "node:crypto";
import pino from "pino";
import type { ControllerOptions } from "@/controller/controller";
import { DateTime } from "luxon";
import mqtt, { type MqttClient } from "mqtt";
import type { Database } from "@/db/client";
import { issueDeviceCredential } from "@/db/device-credentials";
import { houses, plugs, scheduleWindows, schedules, sensors, sites } from "@/db/schema";
import { WEBAPP_USERNAME, deviceUsername } from "@/lib/mqtt/credentials";
import { startPlugDevice } from "@/fakes/plug-device";

export type ControlSite = Awaited<ReturnType<typeof createControlSite>>;

export async function createControlSite(db: Database, plugOverrides: Partial<typeof plugs.$inferInsert> = {}) {
  const slug = `ctl-${randomUUID().slice(0, 8)}`;
  const siteId = randomUUID();
  const houseId = randomUUID();
  const sensorId = randomUUID();
  const heaterId = randomUUID();
  const lightId = randomUUID();
  await db.insert(sites).values({ id: siteId, slug, name: `Control test ${slug}`, timeZone: "Europe/London", currency: "GBP" });
  await db.insert(houses).values({
    id: houseId,
    siteId,
    name: "Test house",
    kind: "glasshouse",
    lengthM: 3,
    widthM: 2,
    eaveHeightM: 2,
    ridgeHeightM: 2.5,
    glazing: "single_glass",
    highLimitC: 30,
  });
  await db.insert(sensors).values({ id: sensorId, siteId, houseId, deviceId: "air-1", name: "Air" });
  await db.insert(plugs).values([
    {
      id: heaterId,
      siteId,
      houseId,
      deviceId: "heater-1",
      name: "Heater",
      applianceKind: "heater",
      applianceWatts: 2000,
      ratedCurrentA: 13,
      sensorId,
      failsafe: "on",
      staleAfterS: 2,
      minOnS: 0,
      minOffS: 0,
      leaseS: 30,
      ...plugOverrides,
    },
    {
      id: lightId,
      siteId,
      houseId,
      deviceId: "light-1",
      name: "Light",
      applianceKind: "light",
      applianceWatts: 100,
      ratedCurrentA: 10,
      failsafe: "off",
      minOnS: 0,
      minOffS: 0,
      leaseS: 30,
    },
  ]);
  const scheduleId = randomUUID();
  await db.insert(schedules).values({ id: scheduleId, plugId: heaterId, name: "All day" });
  await db.insert(scheduleWindows).values({
    scheduleId,
    recurrence: "FREQ=DAILY",
    startsAt: "00:00:00",
    durationMin: 24 * 60,
    mode: "band",
    lowC: 10,
    highC: 12,
  });
  const secrets: Record<string, string> = {};
  for (const [kind, deviceId] of [
    ["plug", "heater-1"],
    ["plug", "light-1"],
    ["sensor", "air-1"],
  ] as const) {
    const { username, secret } = await issueDeviceCredential(db, { siteId, siteSlug: slug, kind, deviceId });
    secrets[username] = secret;
  }
  return {
    slug,
    siteId,
    houseId,
    sensorId,
    heaterId,
    lightId,
    secret: (kind: "plug" | "sensor", device: string) => secrets[deviceUsername(slug, kind, device)]!,
  };
}

export async function connectAs(url: string, username: string, password: string): Promise<MqttClient> {
  const client = await mqtt.connectAsync(url, {
    protocolVersion: 4,
    username,
    password,
    reconnectPeriod: 0,
    connectTimeout: 3000,
    clientId: `test-${randomUUID().slice(0, 8)}`,
  });
  (client.stream as unknown as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
  return client;
}

export function connectWebapp(url: string, secret: string) {
  return connectAs(url, WEBAPP_USERNAME, secret);
}

/** Polls until `check` gives a value that is not undefined/false, or fails after `ms`. */
export async function eventually<T>(check: () => Promise<T | undefined | false> | T | undefined | false, ms = 5000, what = "condition"): Promise<T> {
  const deadline = Date.now() + ms;
  let last: unknown;
  while (Date.now() < deadline) {
    try {
      const value = await check();
      if (value !== undefined && value !== false) return value as T;
    } catch (error) {
      last = error;
    }
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`timed out waiting for ${what}${last ? `: ${String(last)}` : ""}`);
}

/** Controller options for a test site: fast ticks and retries, silent, a free broker port. */
export function testControllerOptions(site: ControlSite, extra: Partial<ControllerOptions> = {}) {
  return {
    databaseUrl: process.env.DATABASE_URL!,
    controllerSecret: randomBytes(24).toString("base64url"),
    webappSecret: randomBytes(24).toString("base64url"),
    mqttPort: 0,
    sites: [site.slug],
    tickMs: 100,
    ackTimeoutMs: 300,
    startupGraceMs: 300,
    flushMs: 30,
    configReloadMs: 60_000,
    logger: pino({ level: "silent" }),
    ...extra,
  } satisfies Partial<ControllerOptions>;
}

/** The test site's simulated heater on a controller's broker: fail-safe off, fast ticks, reconnecting. */
export function startTestHeater(site: ControlSite, url: string) {
  return startPlugDevice({
    url,
    site: site.slug,
    device: "heater-1",
    password: site.secret("plug", "heater-1"),
    ratedW: 2000,
    failsafeOn: false,
    tickMs: 100,
    reportEveryMs: 0,
    reconnectPeriod: 200,
  });
}

/**
 * Gives a plug a one-minute "on" window opening at `opensMs` (a whole second), in the
 * control site's zone (Europe/London). The caller reloads the controller.
 */
export async function addWindowOpeningAt(db: Database, plugId: string, opensMs: number) {
  const scheduleId = randomUUID();
  await db.insert(schedules).values({ id: scheduleId, plugId, name: "Soon" });
  await db.insert(scheduleWindows).values({
    scheduleId,
    recurrence: "FREQ=DAILY",
    startsAt: DateTime.fromMillis(opensMs, { zone: "Europe/London" }).toFormat("HH:mm:ss"),
    durationMin: 1,
    mode: "on",
  });
  return scheduleId;
}
