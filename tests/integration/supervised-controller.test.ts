// `npm start`'s supervisor with the real controller as a child process: killed with
// SIGKILL, it comes back by itself, switching resumes, and the switch log stays a chain.
import { randomBytes, randomUUID } from "node:crypto";
import { and, asc, eq, gt, inArray, isNull, isNotNull } from "drizzle-orm";
import mqtt, { type MqttClient } from "mqtt";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { switchEvents } from "@/db/schema";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { root, waitForPort } from "@/scripts/common";
import { freePort } from "@/scripts/local-server";
import { superviseService, type Supervisor } from "@/scripts/supervisor";
import { createControlSite, eventually, type ControlSite } from "../support/control-site";

const db = getDb();
let site: ControlSite;
let port: number;
let supervisor: Supervisor;
const said: string[] = [];
const output: string[] = [];
const plugs: PlugDevice[] = [];
let sensor: MqttClient;
let temperature = 8;
let feeding: NodeJS.Timeout | undefined;

beforeAll(async () => {
  site = await createControlSite(db);
  port = await freePort();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    CLOCHE_MQTT_PORT: String(port),
    CLOCHE_MQTT_CONTROLLER_SECRET: randomBytes(24).toString("base64url"),
    CLOCHE_MQTT_WEBAPP_SECRET: randomBytes(24).toString("base64url"),
    CLOCHE_SITES: site.slug,
    LOG_LEVEL: "warn",
  };
  delete env.MQTT_URL;
  supervisor = await superviseService({
    name: "controller",
    command: process.execPath,
    args: ["--import", "tsx", "controller/index.ts"],
    env,
    cwd: root,
    firstDelayMs: 200,
    say: (line) => said.push(line),
    output: (line) => output.push(line),
  });
  expect(await waitForPort(port, "127.0.0.1", 20_000, () => supervisor.state !== "given-up")).toBe(true);

  const url = `mqtt://127.0.0.1:${port}`;
  for (const device of ["heater-1", "light-1"]) {
    plugs.push(
      await startPlugDevice({ url, site: site.slug, device, password: site.secret("plug", device), ratedW: 2000, tickMs: 100, reportEveryMs: 0, reconnectPeriod: 200 }),
    );
  }
  sensor = await mqtt.connectAsync(url, {
    protocolVersion: 4,
    username: deviceUsername(site.slug, "sensor", "air-1"),
    password: site.secret("sensor", "air-1"),
    clientId: `test-sensor-${randomUUID().slice(0, 8)}`,
    reconnectPeriod: 200,
  });
  const topic = sensorTopic(site.slug, "air-1");
  feeding = setInterval(() => {
    if (sensor.connected) sensor.publish(topic, JSON.stringify({ temp_c: temperature, rh: 80, battery: 0.9, at: new Date().toISOString() }));
  }, 250);
}, 40_000);

afterAll(async () => {
  clearInterval(feeding);
  await sensor?.endAsync(true);
  await Promise.all(plugs.map((p) => p.close()));
  await supervisor?.stop();
});

/** The heater's newest kept switch to `on`, acknowledged by the plug, after row `afterId`. */
function acknowledgedSwitch(on: boolean, afterId = 0) {
  return eventually(
    async () => {
      const [row] = await db
        .select()
        .from(switchEvents)
        .where(and(eq(switchEvents.plugId, site.heaterId), eq(switchEvents.toOn, on), isNotNull(switchEvents.ackAt), isNull(switchEvents.withdrawnAt), gt(switchEvents.id, afterId)))
        .orderBy(asc(switchEvents.id))
        .limit(1);
      return row;
    },
    15_000,
    `the heater acknowledged ${on ? "on" : "off"}`,
  );
}

describe("a controller under the supervisor", () => {
  it("comes back after SIGKILL, switching resumes and each plug's log stays a chain", async () => {
    try {
      const on = await acknowledgedSwitch(true);

      const killed = supervisor.pid!;
      const next = supervisor.nextStart();
      process.kill(killed, "SIGKILL");
      const restarted = await next;
      expect(restarted).not.toBe(killed);
      expect(said[0]).toBe("controller stopped unexpectedly (killed by SIGKILL); restarting it in 0.2 s.");
      expect(await waitForPort(port, "127.0.0.1", 20_000, () => supervisor.state === "running")).toBe(true);

      // Warm house: the restarted controller switches the heater off, and the plug confirms it.
      temperature = 14;
      const off = await acknowledgedSwitch(false, on.id);
      expect(off.at.getTime()).toBeGreaterThan(on.at.getTime());
      expect(supervisor.state).toBe("running");
      expect(supervisor.restarts).toBe(1);

      const kept = await db
        .select()
        .from(switchEvents)
        .where(and(inArray(switchEvents.plugId, [site.heaterId, site.lightId]), isNull(switchEvents.withdrawnAt)))
        .orderBy(asc(switchEvents.id));
      for (const plugId of [site.heaterId, site.lightId]) {
        const rows = kept.filter((r) => r.plugId === plugId);
        expect(rows.length).toBeGreaterThan(0);
        for (let i = 1; i < rows.length; i++) {
          expect({ id: rows[i]!.id, fromOn: rows[i]!.fromOn }).toEqual({ id: rows[i]!.id, fromOn: rows[i - 1]!.toOn });
        }
      }
    } catch (error) {
      console.error(`controller output:\n${output.join("\n")}\nsupervisor:\n${said.join("\n")}`);
      throw error;
    }
  }, 45_000);
});
