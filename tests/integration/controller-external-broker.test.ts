// With MQTT_URL set, the controller uses that broker: here Debian's mosquitto, started
// by this test on a port of its own (the test runner installs it when missing).
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import mqtt from "mqtt";
import pino from "pino";
import { getDb } from "@/db/client";
import { freePort } from "@/db/local-server";
import { switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { findProgram } from "@/lib/stack/debian";
import { sensorTopic } from "@/lib/mqtt/topics";
import { createControlSite, eventually, type ControlSite } from "../support/control-site";

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
    controller = await createController({
      databaseUrl: process.env.DATABASE_URL!,
      mqttUrl: url,
      controllerSecret: randomBytes(24).toString("base64url"),
      webappSecret: randomBytes(24).toString("base64url"),
      sites: [site.slug],
      tickMs: 100,
      ackTimeoutMs: 300,
      startupGraceMs: 300,
      flushMs: 30,
      logger: pino({ level: "silent" }),
    });
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
});
