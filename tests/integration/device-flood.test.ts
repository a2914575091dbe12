// One sensor sending as fast as TCP lets it must not starve the others: the broker
// holds it back by not reading its socket, cuts it off when it keeps on, and a heater
// and a light in another site still switch on time.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { getDevicesBySite } from "@/db/queries/devices";
import { deviceTraffic } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { CONTROLLER_USERNAME, deviceUsername } from "@/lib/mqtt/credentials";
import { MAX_PAYLOAD_BYTES, plugTopic, sensorTopic } from "@/lib/mqtt/topics";
import { DEFAULT_DEVICE_LIMITS } from "@/lib/mqtt/traffic-limit";
import { addWindowOpeningAt, connectAs, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";
import { flood, publishPacket, rawConnect, remainingLength } from "../support/raw-mqtt";

// The defaults, but cut off after 2 s held back (not 10) and a 3 s cool-off, to keep the test short.
const limits = { ...DEFAULT_DEVICE_LIMITS, cutAfterMs: 2000, coolOffMs: 3000 };

let flooded: ControlSite;
let calm: ControlSite;
let controller: Controller;
let options: ReturnType<typeof testControllerOptions>;
let heater: PlugDevice;
let light: PlugDevice;
let calmSensor: MqttClient;
let listener: MqttClient;
const switched: { device: string; on: boolean; atMs: number }[] = [];
const heard = new Map<string, number>();

function reading(tempC: number) {
  return JSON.stringify({ temp_c: tempC, rh: 80, battery: 0.9, at: new Date().toISOString() });
}

async function trafficRow(site: ControlSite, kind: "plug" | "sensor", device: string) {
  const [row] = await getDb()
    .select()
    .from(deviceTraffic)
    .where(and(eq(deviceTraffic.siteId, site.siteId), eq(deviceTraffic.deviceKind, kind), eq(deviceTraffic.deviceId, device)));
  return row;
}

beforeAll(async () => {
  flooded = await createControlSite(getDb());
  calm = await createControlSite(getDb());
  // No backstop tick: the light must be switched by the edge timer, the heater by its sensor's reading.
  options = testControllerOptions(calm, { sites: [flooded.slug, calm.slug], tickMs: 3_600_000, configReloadMs: 3_600_000, startupGraceMs: 0, deviceLimits: limits, trafficLogMs: 200 });
  controller = await createController(options);
  const plug = (device: string) =>
    startPlugDevice({
      url: controller.mqttUrl,
      site: calm.slug,
      device,
      password: calm.secret("plug", device),
      ratedW: 100,
      tickMs: 100,
      reportEveryMs: 0,
      onSwitch: (on, atMs) => switched.push({ device, on, atMs }),
    });
  [heater, light] = await Promise.all([plug("heater-1"), plug("light-1")]);
  listener = await connectAs(controller.mqttUrl, CONTROLLER_USERNAME, options.controllerSecret);
  await listener.subscribeAsync([sensorTopic(flooded.slug, "air-1"), sensorTopic(calm.slug, "air-1")]);
  listener.on("message", (topic) => heard.set(topic, (heard.get(topic) ?? 0) + 1));
  calmSensor = await connectAs(controller.mqttUrl, deviceUsername(calm.slug, "sensor", "air-1"), calm.secret("sensor", "air-1"));
});

afterAll(async () => {
  await calmSensor?.endAsync();
  await listener?.endAsync();
  await heater?.close();
  await light?.close();
  await controller?.close();
});

describe("a flooding sensor", () => {
  it("is held back and cut off while another site's heater and light switch on time", async () => {
    // The calm site's sensor: warm (heater off), once every 300 ms, well within its limits.
    let calmSent = 0;
    let calmTempC = 13;
    const calmTimer = setInterval(() => {
      calmSent++;
      void calmSensor.publishAsync(sensorTopic(calm.slug, "air-1"), reading(calmTempC), { qos: 1 });
    }, 300);
    await eventually(() => !heater.on && controller.plug(calm.slug, "heater-1")?.knownOn === false, 5000, "heater off");

    // The light's window opens 2.5 s from now, on a whole second.
    const opensMs = Math.ceil((Date.now() + 2500) / 1000) * 1000;
    await addWindowOpeningAt(getDb(), calm.lightId, opensMs);
    await controller.reload(calm.slug);

    // The flooded site's sensor: readings as fast as TCP takes them, QoS 0 and 1 in turn.
    const floodTopic = sensorTopic(flooded.slug, "air-1");
    const device = await rawConnect(controller.broker!.port, deviceUsername(flooded.slug, "sensor", "air-1"), flooded.secret("sensor", "air-1"), "flooder");
    expect(device.returnCode).toBe(0);
    const stop = new AbortController();
    const floodStartMs = Date.now();
    const flooding = flood(device, (i) => publishPacket(floodTopic, reading(11), i % 2 ? 1 : 0, (i % 65_535) + 1), stop.signal);
    const stopAfter = setTimeout(() => stop.abort(), 15_000);

    // A second into the flood the calm house gets cold: its heater must come on at once.
    await new Promise((resolve) => setTimeout(resolve, 1000));
    const coldMs = Date.now();
    calmTempC = 8;
    await calmSensor.publishAsync(sensorTopic(calm.slug, "air-1"), reading(8), { qos: 1 });
    const heaterOn = await eventually(() => switched.find((s) => s.device === "heater-1" && s.on && s.atMs >= coldMs), 3000, "heater on");
    const lightOn = await eventually(() => switched.find((s) => s.device === "light-1" && s.on), 5000, "light on");

    const written = await flooding;
    const floodEndMs = Date.now();
    clearTimeout(stopAfter);
    clearInterval(calmTimer);
    const heaterLagMs = heaterOn.atMs - coldMs;
    const lightLagMs = lightOn.atMs - opensMs;
    const floodHeard = heard.get(floodTopic) ?? 0;
    console.log(
      `flood: ${written} packets written in ${floodEndMs - floodStartMs} ms, ${floodHeard} passed on; ` +
        `heater on ${heaterLagMs} ms after the cold reading, light on ${lightLagMs} ms after its edge`,
    );

    expect(heaterLagMs).toBeLessThan(1000);
    expect(lightLagMs).toBeGreaterThanOrEqual(0);
    expect(lightLagMs).toBeLessThan(1000);
    // Cut off (its socket closed by the broker, not by the 15 s stop).
    expect(stop.signal.aborted).toBe(false);
    await device.closed;
    // Passed on: no more than the burst and the rate over the flood (a few in flight besides).
    expect(floodHeard).toBeGreaterThan(limits.burst);
    expect(floodHeard).toBeLessThanOrEqual(limits.burst + (limits.perSecond * (floodEndMs - floodStartMs)) / 1000 + 2);
    expect(written).toBeGreaterThan(floodHeard);
    const counts = controller.broker!.counts;
    expect(counts.slowed).toBe(1);
    expect(counts.disconnected).toBe(1);

    // Cooling off: signing straight back in is refused with "server unavailable".
    const again = await rawConnect(controller.broker!.port, deviceUsername(flooded.slug, "sensor", "air-1"), flooded.secret("sensor", "air-1"), "flooder");
    expect(again.returnCode).toBe(3);
    await again.closed;
    expect(counts.refusedCoolingOff).toBe(1);

    await controller.flush();
    const row = await trafficRow(flooded, "sensor", "air-1");
    expect(row).toMatchObject({ slowed: 1, oversized: 0, disconnected: 1, lastAction: "disconnected" });
    expect(row!.lastAt!.getTime()).toBeGreaterThanOrEqual(floodStartMs);

    // The calm sensor was never limited, and every reading it sent was passed on.
    await eventually(() => (heard.get(sensorTopic(calm.slug, "air-1")) ?? 0) >= calmSent + 1, 2000, "calm readings heard");
    expect(await trafficRow(calm, "sensor", "air-1")).toBeUndefined();

    // The devices page's list carries it for that device alone, in its own site alone.
    const listed = await getDevicesBySite({ siteId: flooded.siteId, includeRetired: false });
    expect(listed.sensors.find((d) => d.deviceId === "air-1")?.traffic).toEqual({ slowed: 1, oversized: 0, disconnected: 1, lastAt: row!.lastAt });
    expect(listed.plugs.every((d) => d.traffic === undefined)).toBe(true);
    const calmListed = await getDevicesBySite({ siteId: calm.siteId, includeRetired: false });
    expect([...calmListed.plugs, ...calmListed.sensors].every((d) => d.traffic === undefined)).toBe(true);
  });

  it("signs in again after its cool-off, with its limits as before", async () => {
    await new Promise((resolve) => setTimeout(resolve, limits.coolOffMs));
    const device = await rawConnect(controller.broker!.port, deviceUsername(flooded.slug, "sensor", "air-1"), flooded.secret("sensor", "air-1"), "flooder");
    expect(device.returnCode).toBe(0);
    device.socket.end();
    await device.closed;
  });
});

describe("services", () => {
  it("are never held back: the controller's own sign-in sends 200 messages at once", async () => {
    const before = { ...controller.broker!.counts };
    const startMs = Date.now();
    // A sensor the site does not have: the controller's inbox drops these, the broker only passes them on.
    const topic = sensorTopic(calm.slug, "no-such-sensor");
    await Promise.all(Array.from({ length: 200 }, () => listener.publishAsync(topic, reading(11), { qos: 1 })));
    // Under a device's limits the last of them would wait (200 − 20) / 5 = 36 s.
    expect(Date.now() - startMs).toBeLessThan(5000);
    expect(controller.broker!.counts).toEqual(before);
  });
});

describe("an oversized message", () => {
  it("is refused before its body is read, counted, and its device disconnected", async () => {
    const device = await rawConnect(controller.broker!.port, deviceUsername(flooded.slug, "plug", "light-1"), flooded.secret("plug", "light-1"), "big-one");
    expect(device.returnCode).toBe(0);
    const topic = plugTopic(flooded.slug, "light-1", "report");
    // A header announcing a megabyte, then only the topic: the broker must not wait for the rest.
    const announced = 1_000_000;
    const topicField = Buffer.concat([Buffer.from([0, topic.length]), Buffer.from(topic)]);
    device.socket.write(Buffer.concat([Buffer.from([0x30]), remainingLength(announced), topicField]));
    const closedWithin = await Promise.race([device.closed.then(() => true), new Promise((resolve) => setTimeout(() => resolve(false), 1000))]);
    expect(closedWithin).toBe(true);
    expect(controller.broker!.counts.oversized).toBe(1);

    await controller.flush();
    expect(await trafficRow(flooded, "plug", "light-1")).toMatchObject({ slowed: 0, oversized: 1, disconnected: 0, lastAction: "oversized" });
  });

  it("lets a packet of exactly the limit through, to the controller to judge", async () => {
    const client = await connectAs(controller.mqttUrl, deviceUsername(calm.slug, "sensor", "air-1"), calm.secret("sensor", "air-1"));
    const topic = sensorTopic(calm.slug, "air-1");
    const before = heard.get(topic) ?? 0;
    // QoS 1: the topic with its length, the message id, the payload.
    const payload = "x".repeat(limits.maxPacketBytes - (2 + topic.length) - 2);
    expect(payload.length).toBeGreaterThan(MAX_PAYLOAD_BYTES);
    await client.publishAsync(topic, payload, { qos: 1 });
    await eventually(() => (heard.get(topic) ?? 0) > before, 2000, "large reading passed on");
    expect(client.connected).toBe(true);
    await client.endAsync();
    expect(controller.broker!.counts.oversized).toBe(1);
  });
});
