// MariaDB hangs (as a stopped process does: connections accepted, nothing answered,
// nothing closed) while the controller runs. Control must not notice: a device that
// connects signs in, a reading above the high limit turns its heater off at once, and
// every switch made meanwhile is written afterwards, once each and in order.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { connect } from "@/db/client";
import { issueDeviceCredential } from "@/db/device-credentials";
import { switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic, wakeTopic } from "@/lib/mqtt/topics";
import { connectAs, connectWebapp, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";
import { startTcpProxy, type TcpProxy } from "../support/tcp-proxy";

// The test's own look at MariaDB, not through the proxy.
const direct = connect(process.env.DATABASE_URL!);
let site: ControlSite;
let proxy: TcpProxy;
let controller: Controller;
let webappSecret: string;
let heater: PlugDevice;
let sensor: MqttClient;
const switchedAt: { on: boolean; atMs: number }[] = [];
// The sensor keeps reporting, as a real one does, so its readings never go stale.
let temperature = 12.5;
let feeding: NodeJS.Timeout | undefined;

async function publishReading(client: MqttClient, tempC: number) {
  await client.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, rh: 80, at: new Date().toISOString() }), { qos: 1 });
}

/** Sends a reading and waits for the heater itself to switch; returns ms from the send to the switch. */
async function switchHeater(tempC: number, on: boolean): Promise<number> {
  temperature = tempC;
  const sentMs = Date.now();
  await publishReading(sensor, tempC);
  const change = await eventually(() => switchedAt.find((s) => s.on === on && s.atMs >= sentMs), 5000, `heater ${on ? "on" : "off"}`);
  await eventually(() => !controller.plug(site.slug, "heater-1")?.pending, 5000, "the switch acknowledged");
  return change.atMs - sentMs;
}

function storedSince(afterId: number) {
  return direct.db
    .select()
    .from(switchEvents)
    .where(eq(switchEvents.plugId, site.heaterId))
    .orderBy(asc(switchEvents.id))
    .then((rows) => rows.filter((r) => r.id > afterId));
}

beforeAll(async () => {
  site = await createControlSite(direct.db);
  const url = new URL(process.env.DATABASE_URL!);
  proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
  url.host = `127.0.0.1:${proxy.port}`;
  const options = testControllerOptions(site, { databaseUrl: url.toString(), databaseTimeoutMs: 500 });
  webappSecret = options.webappSecret;
  controller = await createController(options);
  heater = await startPlugDevice({
    url: controller.mqttUrl,
    site: site.slug,
    device: "heater-1",
    password: site.secret("plug", "heater-1"),
    ratedW: 2000,
    tickMs: 100,
    reportEveryMs: 0,
    reconnectPeriod: 200,
    onSwitch: (on, atMs) => switchedAt.push({ on, atMs }),
  });
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  feeding = setInterval(() => void publishReading(sensor, temperature).catch(() => undefined), 200);
  await switchHeater(12.5, false).catch(async () => {
    // Already off from the start: nothing to switch.
    if (heater.on) throw new Error("heater did not settle off");
    return 0;
  });
});

afterAll(async () => {
  clearInterval(feeding);
  proxy?.restore();
  // Signed out by the credential test: end it without waiting on its unsent readings.
  sensor?.end(true);
  await heater?.close();
  await controller?.close();
  await proxy?.close();
  await direct.pool.end();
});

describe("the controller while MariaDB hangs", () => {
  it("signs devices in, cuts a heater at the high limit within 100 ms, and writes every switch afterwards once, in order", async () => {
    await controller.flush();
    const [last] = (await storedSince(0)).slice(-1);
    const before = last?.id ?? 0;

    proxy.freeze();
    try {
      // A device reconnecting (its Wi-Fi dropped) signs in from what the controller holds.
      const signInStarted = Date.now();
      const reconnected = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
      const signInMs = Date.now() - signInStarted;
      await reconnected.endAsync();
      expect(signInMs).toBeLessThan(1000);
      // A wrong secret is still refused.
      await expect(connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), "not-the-secret")).rejects.toThrow();

      expect(await switchHeater(8, true)).toBeLessThan(1000);
      // Above the house's high limit (30 °C): off, and fast.
      const cutMs = await switchHeater(31, false);
      expect(cutMs).toBeLessThan(100);
      await switchHeater(8, true);
      await switchHeater(12.5, false);

      // Long enough for every writer to meet its deadline more than once.
      await new Promise((resolve) => setTimeout(resolve, 1500));
      expect(controller.stats().switchesUnwritten).toBeGreaterThanOrEqual(4);
    } finally {
      proxy.restore();
    }

    const rows = await eventually(async () => {
      await controller.flush();
      const stored = await storedSince(before);
      return stored.length >= 4 && stored.every((r) => r.ackAt) && controller.stats().switchesUnwritten === 0 ? stored : undefined;
    }, 15_000, "the switches written once MariaDB answers");
    expect(rows.map((r) => r.toOn)).toEqual([true, false, true, false]);
    expect(rows[1]!.cause).toBe("safety");
    expect(new Set(rows.map((r) => r.commandId)).size).toBe(rows.length);
    for (let i = 1; i < rows.length; i++) expect(rows[i]!.at.getTime()).toBeGreaterThan(rows[i - 1]!.at.getTime());
  }, 60_000);

  it("takes a newly issued credential at once when the app says so, and signs out the replaced one", async () => {
    const username = deviceUsername(site.slug, "sensor", "air-1");
    const old = await connectAs(controller.mqttUrl, username, site.secret("sensor", "air-1"));
    const issued = await issueDeviceCredential(direct.db, { siteId: site.siteId, siteSlug: site.slug, kind: "sensor", deviceId: "air-1" });
    const webapp = await connectWebapp(controller.mqttUrl, webappSecret);
    await webapp.publishAsync(wakeTopic(site.slug), JSON.stringify({ reason: "device" }), { qos: 1 });
    await webapp.endAsync();
    const fresh = await eventually(() => connectAs(controller.mqttUrl, username, issued.secret).catch(() => undefined), 5000, "the new secret accepted");
    await eventually(() => !old.connected, 5000, "the replaced session signed out");
    await expect(connectAs(controller.mqttUrl, username, site.secret("sensor", "air-1"))).rejects.toThrow();
    await fresh.endAsync();
    old.end(true);
  });
});
