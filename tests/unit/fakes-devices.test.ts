// The simulated plug and the simulation against a tiny in-process broker that applies
// the contract's per-device rights (lib/mqtt/credentials).
import net from "node:net";
import type { AddressInfo } from "node:net";
import { Aedes, type Client } from "aedes";
import mqtt, { type MqttClient } from "mqtt";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { createSimulation, type Simulation } from "@/fakes/index";
import type { SiteLayout } from "@/fakes/layout";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { CONTROLLER_USERNAME, deviceUsername, mayPublish, maySubscribe, parseDeviceUsername, type Principal } from "@/lib/mqtt/credentials";
import { plugTopic, sensorTopic } from "@/lib/mqtt/topics";

const SITE = "testacre";
const secrets: Record<string, string> = {
  [CONTROLLER_USERNAME]: "controller-secret",
  [deviceUsername(SITE, "plug", "heater-1")]: "plug-secret",
  [deviceUsername(SITE, "plug", "bench-heater")]: "bench-secret",
  [deviceUsername(SITE, "sensor", "bench-air")]: "sensor-secret",
};

let broker: Aedes;
let server: net.Server;
let url: string;
const refused: string[] = [];

beforeAll(async () => {
  const principals = new WeakMap<Client, Principal>();
  broker = await Aedes.createBroker({
    authenticate(client, username, password, done) {
      const ok = !!username && secrets[username] === password?.toString();
      const who: Principal | null = username === CONTROLLER_USERNAME ? { kind: "controller" } : parseDeviceUsername(username ?? "");
      if (!ok || !who) return done(Object.assign(new Error("refused"), { returnCode: 4 as const }), false);
      principals.set(client, who);
      done(null, true);
    },
    authorizePublish(client, packet, done) {
      const who = client && principals.get(client);
      if (!client || (who && mayPublish(who, packet.topic))) return done(null);
      refused.push(`publish ${packet.topic}`);
      done(new Error("not allowed"));
    },
    authorizeSubscribe(client, sub, done) {
      const who = principals.get(client);
      if (who && maySubscribe(who, sub.topic)) return done(null, sub);
      refused.push(`subscribe ${sub.topic}`);
      done(null, null);
    },
  });
  server = net.createServer({ noDelay: true }, broker.handle);
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  url = `mqtt://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise<void>((resolve) => broker.close(() => resolve()));
  await new Promise<void>((resolve) => server.close(() => resolve()));
  expect(refused).toEqual([]);
});

type Message = { topic: string; payload: unknown; retain: boolean };

async function controller() {
  const client = await mqtt.connectAsync(url, {
    protocolVersion: 4,
    username: CONTROLLER_USERNAME,
    password: secrets[CONTROLLER_USERNAME],
    clientId: `test-controller-${Math.random().toString(16).slice(2)}`,
    reconnectPeriod: 0,
  });
  const messages: Message[] = [];
  client.on("message", (topic, payload, packet) => {
    let value: unknown;
    try {
      value = JSON.parse(payload.toString());
    } catch {
      value = payload.toString();
    }
    messages.push({ topic, payload: value, retain: packet.retain });
  });
  await client.subscribeAsync(`cloche/v1/${SITE}/#`, { qos: 1 });
  return { client, messages };
}

async function until<T>(probe: () => T | undefined, what: string, ms = 3000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const value = probe();
    if (value !== undefined) return value;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 5));
  }
}

const closers: (() => Promise<unknown>)[] = [];
afterEach(async () => {
  while (closers.length) await closers.pop()!();
});

describe("simulated plug", () => {
  const t0 = Date.parse("2026-01-15T06:00:00Z");

  async function plug(clock: { t: number }): Promise<PlugDevice> {
    const p = await startPlugDevice({
      url,
      site: SITE,
      device: "heater-1",
      password: secrets[deviceUsername(SITE, "plug", "heater-1")]!,
      ratedW: 2000,
      now: () => clock.t,
      tickMs: 0,
      reportEveryMs: 0,
      reconnectPeriod: 0,
    });
    closers.push(() => p.close());
    return p;
  }

  it("says it is online, obeys a command, echoes the id in its retained report and falls back after the lease", async () => {
    const clock = { t: t0 };
    const ctl = await controller();
    closers.push(() => ctl.client.endAsync());
    const p = await plug(clock);
    const report = plugTopic(SITE, "heater-1", "report");
    const reports = () => ctl.messages.filter((m) => m.topic === report).map((m) => m.payload as Record<string, unknown>);

    await until(() => ctl.messages.find((m) => m.topic === plugTopic(SITE, "heater-1", "presence") && m.payload === "online"), "presence");
    await until(() => reports().find((r) => r.on === false && r.cmd === null), "first report");

    await ctl.client.publishAsync(plugTopic(SITE, "heater-1", "command"), JSON.stringify({ id: "cmd-1", on: true, lease_s: 60 }), { qos: 1 });
    const echoed = await until(() => reports().find((r) => r.cmd === "cmd-1"), "echo");
    expect(echoed).toMatchObject({ on: true, watts: expect.any(Number), wh: 0, at: new Date(t0).toISOString() });
    expect(p.on).toBe(true);

    // The same state again is still acknowledged.
    await ctl.client.publishAsync(plugTopic(SITE, "heater-1", "command"), JSON.stringify({ id: "cmd-2", on: true, lease_s: 60 }), { qos: 1 });
    await until(() => reports().find((r) => r.cmd === "cmd-2"), "second echo");

    // Junk is dropped and counted; the plug keeps going.
    for (const junk of ["not json", JSON.stringify({ id: "x", on: "yes", lease_s: 60 }), JSON.stringify({ id: "y", on: true, lease_s: 1 })]) {
      await ctl.client.publishAsync(plugTopic(SITE, "heater-1", "command"), junk, { qos: 1 });
    }
    await until(() => (p.stats.malformed === 3 ? true : undefined), "malformed count");
    expect(p.on).toBe(true);

    clock.t = t0 + 60_000;
    await p.tick();
    expect(p.on).toBe(true);
    clock.t = t0 + 60_001;
    await p.tick();
    expect(p.on).toBe(false);
    const fell = await until(() => reports().find((r) => r.on === false && r.cmd === null && r.at === new Date(t0 + 60_001).toISOString()), "fall-back report");
    // 2000 W ± 1.5 % for 60 s ≈ 33.3 Wh.
    expect(fell.wh).toBeGreaterThan(32.5);
    expect(fell.wh).toBeLessThan(34);

    // A late subscriber gets the retained report.
    const late = await controller();
    closers.push(() => late.client.endAsync());
    const retained = await until(() => late.messages.find((m) => m.topic === report && m.retain), "retained report");
    expect(retained.payload).toMatchObject({ on: false, cmd: null });
  });

  it("says offline when it closes, and closing twice is harmless", async () => {
    const ctl = await controller();
    closers.push(() => ctl.client.endAsync());
    const p = await plug({ t: t0 });
    const presence = plugTopic(SITE, "heater-1", "presence");
    await until(() => ctl.messages.find((m) => m.topic === presence && m.payload === "online"), "online");
    await Promise.all([p.close(), p.close()]);
    await p.close();
    await until(() => ctl.messages.find((m) => m.topic === presence && m.payload === "offline"), "offline");
  });

  it("leaves its last will when the connection drops", async () => {
    const ctl = await controller();
    closers.push(() => ctl.client.endAsync());
    const p = await plug({ t: t0 });
    const presence = plugTopic(SITE, "heater-1", "presence");
    await until(() => ctl.messages.find((m) => m.topic === presence && m.payload === "online"), "online");
    ctl.messages.length = 0;
    (p.client as MqttClient).stream.destroy();
    await until(() => ctl.messages.find((m) => m.topic === presence && m.payload === "offline"), "will");
    await p.close();
  });
});

describe("simulation", () => {
  const layout: SiteLayout = {
    site: { id: "site-1", slug: SITE, timeZone: "Europe/London" },
    houses: [
      {
        id: "house-1",
        name: "Bench House",
        shape: { kind: "propagation", lengthM: 6, widthM: 3.5, eaveHeightM: 2, ridgeHeightM: 2.8, glazing: "twin_wall_polycarbonate", airChangesPerHour: 0.8 },
      },
    ],
    plugs: [{ id: "plug-1", houseId: "house-1", deviceId: "bench-heater", applianceKind: "heater", applianceWatts: 1000, failsafeOn: false, metersEnergy: true }],
    sensors: [{ id: "sensor-1", houseId: "house-1", deviceId: "bench-air", placement: "inside" }],
  };

  it("warms the house while its heater plug is on and publishes readings, on a fake clock", async () => {
    // Night in January: no sun to muddle the heater's effect.
    const t0 = Date.parse("2026-01-15T01:00:00Z");
    const clock = { t: t0 };
    const ctl = await controller();
    closers.push(() => ctl.client.endAsync());
    const sim: Simulation = await createSimulation({ mqttUrl: url, layout, secrets, now: () => clock.t, tickMs: 0, reconnectPeriod: 0 });
    closers.push(() => sim.close());
    expect(sim.plugs.size).toBe(1);
    expect(sim.sensors.size).toBe(1);

    const start = sim.house("Bench House").airC;
    await ctl.client.publishAsync(plugTopic(SITE, "bench-heater", "command"), JSON.stringify({ id: "warm", on: true, lease_s: 1800 }), { qos: 1 });
    await until(() => (sim.plugs.get("bench-heater")!.on ? true : undefined), "heater on");

    for (let minute = 1; minute <= 30; minute++) {
      clock.t = t0 + minute * 60_000;
      await sim.tick();
    }
    const warmed = sim.house("house-1").airC;
    expect(warmed - start).toBeGreaterThan(2);
    expect(sim.house("house-1").heatW).toBeGreaterThan(980);

    const readings = await until(() => {
      const r = ctl.messages.filter((m) => m.topic === sensorTopic(SITE, "bench-air"));
      return r.length >= 30 ? r : undefined;
    }, "readings");
    expect((readings.at(-1)!.payload as { temp_c: number }).temp_c).toBeCloseTo(warmed, 0);

    // The lease runs out 30 min after the command, inside this 2 h jump: the house then cools.
    clock.t = t0 + 3 * 3600_000;
    await sim.tick();
    expect(sim.plugs.get("bench-heater")!.on).toBe(false);
    expect(sim.house("house-1").airC).toBeLessThan(warmed - 1);
    await until(() => ctl.messages.find((m) => m.topic === plugTopic(SITE, "bench-heater", "report") && (m.payload as { cmd: unknown }).cmd === null && (m.payload as { at: string }).at === new Date(t0 + 1_800_001).toISOString()), "fall-back at the lease's end");

    await Promise.all([sim.close(), sim.close()]);
  });

  it("runs by itself on the built-in clock, faster than real time", async () => {
    const startMs = Date.parse("2026-01-15T01:00:00Z");
    const sim = await createSimulation({ mqttUrl: url, layout, secrets, startMs, speed: 3600, tickMs: 20, reconnectPeriod: 0 });
    closers.push(() => sim.close());
    await until(() => (sim.model.atMs >= startMs + 10 * 60_000 ? true : undefined), "ten simulated minutes");
    expect(sim.now()).toBeGreaterThan(startMs + 10 * 60_000);
    await until(() => (sim.sensors.get("bench-air")!.stats.readings > 0 ? true : undefined), "a reading");
  });

  it("leaves a device without a secret unplugged", async () => {
    const sim = await createSimulation({ mqttUrl: url, layout, secrets: {}, now: () => 0, tickMs: 0 });
    closers.push(() => sim.close());
    expect(sim.plugs.size + sim.sensors.size).toBe(0);
  });
});
