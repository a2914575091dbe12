// The controller against the real MariaDB, its embedded broker and simulated plugs.
import { randomBytes, randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq, isNull } from "drizzle-orm";
import pino from "pino";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { getSiteLive } from "@/db/queries/live";
import { alerts, overrides, switchEvents, user } from "@/db/schema";
import { issueDeviceCredential } from "@/db/device-credentials";
import { createController, type Controller, type ControllerOptions } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { CONTROLLER_USERNAME, deviceUsername } from "@/lib/mqtt/credentials";
import { plugTopic, sensorTopic, wakeTopic } from "@/lib/mqtt/topics";
import { connectAs, connectWebapp, createControlSite, eventually, type ControlSite } from "../support/control-site";

const controllerSecret = randomBytes(24).toString("base64url");
const webappSecret = randomBytes(24).toString("base64url");
const logger = pino({ level: "silent" });

let site: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let light: PlugDevice;
let sensor: MqttClient;

function controllerOptions(extra: Partial<ControllerOptions> = {}) {
  return {
    databaseUrl: process.env.DATABASE_URL!,
    controllerSecret,
    webappSecret,
    mqttPort: 0,
    sites: [site.slug],
    tickMs: 100,
    ackTimeoutMs: 300,
    unansweredAfter: 3,
    startupGraceMs: 300,
    flushMs: 30,
    configReloadMs: 60_000,
    logger,
    ...extra,
  };
}

function startPlug(url: string, device: string, failsafeOn = false) {
  return startPlugDevice({
    url,
    site: site.slug,
    device,
    password: site.secret("plug", device),
    ratedW: device.startsWith("heater") ? 2000 : 100,
    failsafeOn,
    tickMs: 100,
    reportEveryMs: 0,
    reconnectPeriod: 200,
  });
}

async function publishReading(tempC: number | null, client = sensor) {
  await client.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, rh: 80, battery: 0.9, at: new Date().toISOString() }), { qos: 1 });
}

async function events(plugId = site.heaterId) {
  await controller.flush();
  return getDb().select().from(switchEvents).where(eq(switchEvents.plugId, plugId)).orderBy(asc(switchEvents.id));
}

async function lastEvent(plugId = site.heaterId) {
  const all = await events(plugId);
  return all.at(-1);
}

/** A reading every 200 ms keeps the sensor fresh while a test looks at something else. */
let temperature = 12.5;
let feeding: NodeJS.Timeout | undefined;
function keepFeeding() {
  clearInterval(feeding);
  feeding = setInterval(() => void publishReading(temperature).catch(() => undefined), 200);
}

beforeAll(async () => {
  site = await createControlSite(getDb());
  controller = await createController(controllerOptions());
  heater = await startPlug(controller.mqttUrl, "heater-1", true);
  light = await startPlug(controller.mqttUrl, "light-1");
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  keepFeeding();
  // The heater starts on its own fail-safe (on); a warm house brings it off first.
  await eventually(() => !heater.on, 5000, "heater settled off");
});

afterAll(async () => {
  clearInterval(feeding);
  await sensor?.endAsync();
  await heater?.close();
  await light?.close();
  await controller?.close();
});

describe("the controller", () => {
  it("switches the heater on for a cold reading and logs the switch with its latency", async () => {
    temperature = 8;
    await publishReading(8);
    await eventually(() => heater.on, 5000, "heater on");
    const event = await eventually(async () => {
      const e = await lastEvent();
      return e?.toOn && e.ackAt ? e : undefined;
    }, 5000, "acknowledged switch");
    expect(event).toMatchObject({ toOn: true, cause: "schedule", readingTempC: 8 });
    expect(event.commandId).toMatch(/^[0-9a-f-]{36}$/);
    expect(event.latencyMs).toBeGreaterThanOrEqual(0);
    expect(event.latencyMs).toBeLessThan(2000);
    expect(event.ackAt!.getTime()).toBeGreaterThanOrEqual(event.at.getTime());
  });

  it("switches it off at the band's high edge, and keeps it off between the edges", async () => {
    temperature = 12.5;
    await publishReading(12.5);
    await eventually(() => !heater.on, 5000, "heater off");
    const off = await eventually(async () => {
      const e = await lastEvent();
      return e && !e.toOn && e.ackAt ? e : undefined;
    });
    expect(off).toMatchObject({ fromOn: true, toOn: false, cause: "schedule", readingTempC: 12.5 });
    temperature = 11;
    await publishReading(11);
    await new Promise((resolve) => setTimeout(resolve, 600));
    expect(heater.on).toBe(false);
    expect((await lastEvent())!.id).toBe(off.id);
  });

  it("lets an override win while it lasts, woken over MQTT by the web app, then returns to the schedule", async () => {
    const db = getDb();
    const userId = randomUUID();
    await db.insert(user).values({ id: userId, name: "Override Tester", email: `override-${userId.slice(0, 8)}@test.example` });
    const overrideId = randomUUID();
    await db.insert(overrides).values({
      id: overrideId,
      plugId: site.heaterId,
      on: true,
      startsAt: new Date(Date.now() - 1000),
      endsAt: new Date(Date.now() + 1500),
      userId,
      reason: "Drying the benches after watering",
    });
    const webapp = await connectWebapp(controller.mqttUrl, webappSecret);
    await webapp.publishAsync(wakeTopic(site.slug), JSON.stringify({ reason: "override", plug: "heater-1" }));
    await webapp.endAsync();

    await eventually(() => heater.on, 3000, "override on");
    const on = await eventually(async () => {
      const e = await lastEvent();
      return e?.toOn ? e : undefined;
    });
    expect(on).toMatchObject({ cause: "override", userId, overrideId });

    // It ends on its own: 11 °C lies between the edges, so the schedule keeps the state it
    // finds (on). The overview says so: switched on by the override, held on by the schedule.
    const held = await eventually(async () => {
      await controller.flush();
      const live = (await getSiteLive({ siteId: site.siteId })).plugs.find((p) => p.plugId === site.heaterId);
      return live?.presentCause === "schedule" ? live : undefined;
    }, 5000, "held on by the schedule after the override");
    expect(held).toMatchObject({ on: true, cause: "override", acknowledged: true });
    expect(heater.on).toBe(true);
    // Warm it past the high edge to see the schedule switch it.
    temperature = 12.5;
    await eventually(() => !heater.on, 5000, "back to schedule");
    expect(await lastEvent()).toMatchObject({ toOn: false, cause: "schedule" });
  });

  it("puts the heater on its fail-safe when the sensor goes quiet, with an alert, and back when it speaks", async () => {
    clearInterval(feeding);
    await eventually(() => heater.on, 6000, "fail-safe on");
    expect(await lastEvent()).toMatchObject({ toOn: true, cause: "failsafe" });
    const open = await eventually(async () => {
      const rows = await getDb()
        .select()
        .from(alerts)
        .where(and(eq(alerts.siteId, site.siteId), eq(alerts.kind, "sensor_quiet"), isNull(alerts.clearedAt)));
      return rows.length ? rows : undefined;
    });
    expect(open[0]!.sensorId).toBe(site.sensorId);

    temperature = 12.5;
    keepFeeding();
    await eventually(() => !heater.on, 5000, "schedule again");
    await eventually(async () => {
      const rows = await getDb()
        .select()
        .from(alerts)
        .where(and(eq(alerts.siteId, site.siteId), eq(alerts.kind, "sensor_quiet"), isNull(alerts.clearedAt)));
      return rows.length === 0;
    }, 3000, "alert cleared");
  });

  it("drops malformed and unknown messages, counts them, and keeps working", async () => {
    const before = { ...controller.stats().dropped };
    const topic = sensorTopic(site.slug, "air-1");
    await sensor.publishAsync(topic, "not json at all", { qos: 1 });
    await sensor.publishAsync(topic, JSON.stringify({ temp_c: "warm", at: "yesterday" }), { qos: 1 });
    await sensor.publishAsync(topic, JSON.stringify({ temp_c: 9, rh: 80, at: new Date().toISOString(), pad: "x".repeat(5000) }), { qos: 1 });
    // The controller's own sign-in may publish anywhere: use it for topics no device may use.
    const admin = await connectAs(controller.mqttUrl, CONTROLLER_USERNAME, controllerSecret);
    await admin.publishAsync(`cloche/v1/${site.slug}/sensor/ghost/reading`, JSON.stringify({ temp_c: 1, at: new Date().toISOString() }), { qos: 1 });
    await admin.publishAsync(`cloche/v1/${site.slug}/plug/Bad_Id/report`, "{}", { qos: 1 });
    await admin.publishAsync(plugTopic(site.slug, "heater-1", "report"), JSON.stringify({ on: "yes" }), { qos: 1 });
    await admin.endAsync();

    const dropped = await eventually(() => {
      const d = controller.stats().dropped;
      const grew = (k: string) => (d[k] ?? 0) > (before[k] ?? 0);
      return grew("bad_reading") && (d.bad_reading ?? 0) - (before.bad_reading ?? 0) >= 3 && grew("unknown_sensor") && grew("unknown_topic") && grew("bad_report") ? d : undefined;
    }, 3000, "drop counters");
    expect(dropped.bad_reading! - (before.bad_reading ?? 0)).toBe(3);

    // Still working: a cold reading switches the heater on.
    temperature = 8;
    await eventually(() => heater.on, 5000, "still switching");
  });

  it("refuses a device that publishes or subscribes under another device's topics", async () => {
    const broker = controller.broker!;
    const refusedBefore = broker.counts.refusedPublishes;
    const intruder = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
    const closed = new Promise<void>((resolve) => intruder.once("close", () => resolve()));
    intruder.publish(plugTopic(site.slug, "heater-1", "report"), JSON.stringify({ on: false, cmd: "forged", at: new Date().toISOString() }), { qos: 1 });
    await closed;
    expect(broker.counts.refusedPublishes).toBe(refusedBefore + 1);
    intruder.end(true);
    expect(heater.on).toBe(true);

    const snooper = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "plug", "light-1"), site.secret("plug", "light-1"));
    const subscriptionsBefore = broker.counts.refusedSubscriptions;
    // The broker answers SUBACK 128, which mqtt.js turns into an error.
    await expect(snooper.subscribeAsync(plugTopic(site.slug, "heater-1", "command"), { qos: 1 })).rejects.toThrow(/Subscribe error/);
    expect(broker.counts.refusedSubscriptions).toBe(subscriptionsBefore + 1);
    await snooper.endAsync();

    await expect(connectAs(controller.mqttUrl, deviceUsername(site.slug, "plug", "heater-1"), "a-wrong-secret")).rejects.toThrow();
  });

  it("restarts without losing or repeating a switch", async () => {
    temperature = 8;
    await eventually(() => heater.on, 5000);
    const before = await events();

    clearInterval(feeding);
    await controller.close();
    controller = await createController(controllerOptions());
    // The broker lived in the old controller: the devices connect to the new one.
    await heater.close();
    await light.close();
    heater = await startPlug(controller.mqttUrl, "heater-1", true);
    light = await startPlug(controller.mqttUrl, "light-1");
    await sensor.endAsync();
    sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
    temperature = 12.5;
    keepFeeding();
    await eventually(() => !heater.on, 6000, "controlled again after restart");

    const after = await events();
    // Nothing from before is lost or written twice.
    expect(after.slice(0, before.length).map((e) => e.commandId)).toEqual(before.map((e) => e.commandId));
    expect(new Set(after.map((e) => e.commandId)).size).toBe(after.length);
    // The log is a chain: each switch starts from the state the one before ended in.
    for (let i = 1; i < after.length; i++) expect(after[i]!.fromOn).toBe(after[i - 1]!.toOn);
    expect(after.at(-1)!.toOn).toBe(heater.on);
  });

  it("a plug whose lease runs out falls back to its fail-safe on its own", async () => {
    // A plug the controller does not manage, so only our command reaches it.
    const { secret } = await issueDeviceCredential(getDb(), { siteId: site.siteId, siteSlug: site.slug, kind: "plug", deviceId: "spare-1" });
    let clock = Date.now();
    const spare = await startPlugDevice({
      url: controller.mqttUrl,
      site: site.slug,
      device: "spare-1",
      password: secret,
      ratedW: 500,
      failsafeOn: false,
      now: () => clock,
      tickMs: 0,
      reportEveryMs: 0,
    });
    const admin = await connectAs(controller.mqttUrl, CONTROLLER_USERNAME, controllerSecret);
    const reports: { on: boolean; cmd: string | null }[] = [];
    await admin.subscribeAsync(plugTopic(site.slug, "spare-1", "report"), { qos: 1 });
    admin.on("message", (_topic, payload) => reports.push(JSON.parse(payload.toString())));
    const id = randomUUID();
    await admin.publishAsync(plugTopic(site.slug, "spare-1", "command"), JSON.stringify({ id, on: true, lease_s: 10 }), { qos: 1 });
    await eventually(() => spare.on, 3000, "spare on");
    await eventually(() => reports.some((r) => r.cmd === id && r.on), 3000, "report echoing the command id");

    clock += 9_000;
    await spare.tick();
    expect(spare.on).toBe(true);
    clock += 2_000;
    await spare.tick();
    expect(spare.on).toBe(false);
    await eventually(() => reports.some((r) => !r.on && r.cmd === null), 3000, "fall-back report without a command id");
    await admin.endAsync();
    await spare.close();
  });
});
