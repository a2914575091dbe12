// The controller's in-process way into its own broker: it must hear what a network
// subscription would (retained messages first, then live ones, newest winning) and its
// commands must reach devices as QoS 1 messages.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import mqtt, { type MqttClient } from "mqtt";
import pino from "pino";
import { createBroker, type Broker } from "@/controller/broker";
import type { BrokerLink } from "@/controller/link";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { hashDeviceSecret, newDeviceSecret } from "@/lib/server/device-secrets";
import { plugTopic } from "@/lib/mqtt/topics";

const SITE = "link-test";
const secrets = new Map<string, string>();
const hashes = new Map<string, string>();
let broker: Broker;
const devices: MqttClient[] = [];
const links: BrokerLink[] = [];

async function device(name: string) {
  const username = deviceUsername(SITE, "plug", name);
  if (!secrets.has(username)) {
    const secret = newDeviceSecret();
    secrets.set(username, secret);
    hashes.set(username, hashDeviceSecret(secret));
  }
  const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${broker.port}`, { protocolVersion: 4, username, password: secrets.get(username), reconnectPeriod: 0 });
  devices.push(client);
  return client;
}

function listen(subscriptions: string[]) {
  const heard: { topic: string; payload: string }[] = [];
  return {
    heard,
    open: async () => {
      const link = await broker.link({ subscriptions, onMessage: (topic, payload) => heard.push({ topic, payload: payload.toString() }), logger: pino({ level: "silent" }) });
      links.push(link);
      return link;
    },
  };
}

const until = async (check: () => boolean, ms = 2000) => {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error("timed out");
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
};

beforeAll(async () => {
  broker = await createBroker({
    host: "127.0.0.1",
    port: 0,
    controllerSecret: "controller-secret-for-tests",
    webappSecret: "webapp-secret-for-tests",
    deviceSecret: (username) => hashes.get(username) ?? null,
    logger: pino({ level: "silent" }),
  });
});

afterAll(async () => {
  await Promise.all(links.map((l) => l.close()));
  await Promise.all(devices.map((d) => d.endAsync()));
  await broker.close();
});

describe("the in-process link to the embedded broker", () => {
  it("hears what was retained before it subscribed, once, then what arrives live", async () => {
    const plug = await device("heater-a");
    const report = plugTopic(SITE, "heater-a", "report");
    await plug.publishAsync(report, JSON.stringify({ on: true, cmd: "c1" }), { qos: 1, retain: true });
    await plug.publishAsync(plugTopic(SITE, "heater-a", "presence"), JSON.stringify("online"), { qos: 1, retain: true });

    const { heard, open } = listen([`cloche/v1/+/plug/+/report`]);
    await open();
    // Only the filter's topics, and the retained report exactly once.
    expect(heard).toEqual([{ topic: report, payload: JSON.stringify({ on: true, cmd: "c1" }) }]);

    await plug.publishAsync(report, JSON.stringify({ on: false, cmd: "c2" }), { qos: 1, retain: true });
    await until(() => heard.length === 2);
    expect(heard[1]!.payload).toBe(JSON.stringify({ on: false, cmd: "c2" }));
  });

  it("publishes commands that a device subscribed at QoS 1 receives at QoS 1, not retained", async () => {
    const plug = await device("heater-b");
    const command = plugTopic(SITE, "heater-b", "command");
    const got: mqtt.IPublishPacket[] = [];
    plug.on("message", (_topic, _payload, packet) => got.push(packet));
    await plug.subscribeAsync(command, { qos: 1 });
    const link = await listen([`cloche/v1/+/plug/+/report`]).open();
    const errors: Error[] = [];
    link.publish(command, JSON.stringify({ id: "k1", on: true, lease_s: 60 }), (e) => errors.push(e));
    await until(() => got.length === 1);
    expect(got[0]).toMatchObject({ topic: command, qos: 1, retain: false });
    expect(JSON.parse(got[0]!.payload.toString())).toEqual({ id: "k1", on: true, lease_s: 60 });
    expect(errors).toEqual([]);
  });

  it("after close hears nothing and refuses to publish, and closing twice is harmless", async () => {
    const plug = await device("heater-c");
    const { heard, open } = listen([plugTopic(SITE, "heater-c", "report")]);
    const link = await open();
    await link.close();
    await link.close();
    await plug.publishAsync(plugTopic(SITE, "heater-c", "report"), JSON.stringify({ on: true }), { qos: 1, retain: true });
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(heard).toEqual([]);
    const errors: Error[] = [];
    link.publish(plugTopic(SITE, "heater-c", "command"), "{}", (e) => errors.push(e));
    expect(errors.map((e) => e.message)).toEqual(["link closed"]);
  });
});
