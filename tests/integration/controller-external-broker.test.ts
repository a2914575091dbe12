// With MQTT_URL set, the controller uses that broker: here Debian's mosquitto, started
// by this test on a port of its own (the test runner installs it when missing).
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import mqtt from "mqtt";
import { getDb } from "@/db/client";
import { freePort } from "@/scripts/local-server";
import { switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { findProgram } from "@/scripts/debian";
import { plugTopic, sensorTopic } from "@/lib/mqtt/topics";
import { createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";

const mosquittoPath = findProgram(["mosquitto"]);


describe.skipIf(!mosquittoPath)("the controller on an external broker (mosquitto)", () => {
  let broker: ChildProcess;
  let url: string;
  let site: ControlSite;
  let controller: Controller;
  let heater: PlugDevice;

  beforeAll(async () => {
    const port = await freePort();
    const dir = mkdtempSync(path.join(os.tmpdir(), "cloche-mosquitto-"));
    const conf = path.join(dir, "mosquitto.conf");
    // Anonymous on loopback only: rights on an external broker are that broker's job.
    writeFileSync(
      conf,
      [`listener ${port} 127.0.0.1`, "allow_anonymous true", "set_tcp_nodelay true", "persistence false", "max_queued_messages 10000", "max_inflight_messages 0", ""].join("\n"),
    );
    broker = spawn(mosquittoPath!, ["-c", conf], { stdio: "ignore" });
    url = `mqtt://127.0.0.1:${port}`;
    await eventually(async () => {
      const c = await mqtt.connectAsync(url, { protocolVersion: 4, reconnectPeriod: 0, connectTimeout: 500 });
      await c.endAsync();
      return true;
    }, 10_000, "mosquitto up");

    site = await createControlSite(getDb());
    controller = await createController(testControllerOptions(site, { mqttUrl: url }));
    heater = await startPlugDevice({ url, site: site.slug, device: "heater-1", password: "unused", ratedW: 2000, tickMs: 100, reportEveryMs: 0 });
  });

  afterAll(async () => {
    await heater?.close();
    await controller?.close();
    broker?.kill("SIGTERM");
  });

  it("uses it: a cold reading switches the heater on and the switch is logged and acknowledged", async () => {
    expect(controller.broker).toBeNull();
    const sensor = await mqtt.connectAsync(url, { protocolVersion: 4, reconnectPeriod: 0 });
    const publish = (tempC: number) =>
      sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, at: new Date().toISOString() }), { qos: 1 });
    // Warm first: with no reading yet the heater is on its fail-safe (on).
    await publish(12.5);
    await eventually(() => !heater.on, 5000, "heater off");
    await publish(8);
    await eventually(() => heater.on, 5000, "heater on");
    const event = await eventually(async () => {
      await controller.flush();
      const rows = await getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId)).orderBy(asc(switchEvents.id));
      const last = rows.at(-1);
      return last?.toOn && last.ackAt ? last : undefined;
    }, 5000, "acknowledged switch");
    expect(event).toMatchObject({ cause: "schedule", readingTempC: 8 });
    await sensor.endAsync();
  });

  it("reconciles with the plugs' retained reports when it restarts: nothing repeated, a change made meanwhile logged as resync", async () => {
    const storedSwitches = async () => {
      await controller.flush();
      return getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId)).orderBy(asc(switchEvents.id));
    };
    const sensor = await mqtt.connectAsync(url, { protocolVersion: 4, reconnectPeriod: 0 });
    const feeding = setInterval(() => {
      void sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: 8, at: new Date().toISOString() }), { qos: 1 }).catch(() => undefined);
    }, 200);
    try {
      await eventually(() => heater.on, 5000, "heater on");
      const before = await storedSwitches();

      // 1. A restart with nothing changed: the retained report agrees with the log.
      await controller.close();
      controller = await createController(testControllerOptions(site, { mqttUrl: url }));
      await new Promise((resolve) => setTimeout(resolve, 1500));
      expect((await storedSwitches()).map((e) => e.commandId)).toEqual(before.map((e) => e.commandId));
      expect(heater.on).toBe(true);

      // 2. While the controller is away, someone else switches the plug off.
      await controller.close();
      const stranger = await mqtt.connectAsync(url, { protocolVersion: 4, reconnectPeriod: 0 });
      await stranger.publishAsync(plugTopic(site.slug, "heater-1", "command"), JSON.stringify({ id: "by-hand-1", on: false, lease_s: 30 }), { qos: 1 });
      await eventually(() => !heater.on, 5000, "heater off by hand");
      await stranger.endAsync();
      controller = await createController(testControllerOptions(site, { mqttUrl: url }));
      await eventually(() => heater.on, 5000, "heater on again under the controller");

      const after = await eventually(async () => {
        const rows = await storedSwitches();
        return rows.length === before.length + 2 && rows.every((r) => r.ackAt) ? rows : undefined;
      }, 5000, "the resync and the switch back on");
      const [resync, back] = after.slice(before.length);
      expect(resync).toMatchObject({ fromOn: true, toOn: false, cause: "resync" });
      expect(back).toMatchObject({ fromOn: false, toOn: true, cause: "schedule" });
      expect(new Set(after.map((e) => e.commandId)).size).toBe(after.length);
      for (let i = 1; i < after.length; i++) expect(after[i]!.fromOn).toBe(after[i - 1]!.toOn);
    } finally {
      clearInterval(feeding);
      await sensor.endAsync();
    }
  });
});
