// A house (with its plugs and sensors) deleted in the app while the controller still
// has rows waiting for them: those rows can never be written (their foreign keys fail),
// and they must not hold back every other row behind them. Rows wait because MariaDB
// is away for a moment (a proxy cut), which is when a deletion is most likely to race.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { connect } from "@/db/client";
import { houses, readings, switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { connectAs, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";
import { startTcpProxy, type TcpProxy } from "../support/tcp-proxy";

const direct = connect(process.env.DATABASE_URL!);
let gone: ControlSite;
let kept: ControlSite;
let proxy: TcpProxy;
let controller: Controller;
let heater: PlugDevice;
let goneSensor: MqttClient;
let keptSensor: MqttClient;

const reading = (site: ControlSite, tempC: number) => JSON.stringify({ temp_c: tempC, rh: 70, at: new Date().toISOString() });

beforeAll(async () => {
  gone = await createControlSite(direct.db);
  kept = await createControlSite(direct.db);
  const url = new URL(process.env.DATABASE_URL!);
  proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
  url.host = `127.0.0.1:${proxy.port}`;
  controller = await createController({ ...testControllerOptions(gone, { databaseUrl: url.toString() }), sites: [gone.slug, kept.slug] });
  heater = await startPlugDevice({ url: controller.mqttUrl, site: gone.slug, device: "heater-1", password: gone.secret("plug", "heater-1"), ratedW: 2000, tickMs: 100, reportEveryMs: 0 });
  goneSensor = await connectAs(controller.mqttUrl, deviceUsername(gone.slug, "sensor", "air-1"), gone.secret("sensor", "air-1"));
  keptSensor = await connectAs(controller.mqttUrl, deviceUsername(kept.slug, "sensor", "air-1"), kept.secret("sensor", "air-1"));
});

afterAll(async () => {
  proxy?.restore();
  goneSensor?.end(true);
  keptSensor?.end(true);
  await heater?.close();
  await controller?.close();
  await proxy?.close();
  await direct.pool.end();
});

describe("rows waiting for a house deleted meanwhile", () => {
  it("are dropped, and everything else is still written", async () => {
    proxy.cut();
    // A switch, readings and presence waiting for the house about to go…
    await goneSensor.publishAsync(sensorTopic(gone.slug, "air-1"), reading(gone, 8), { qos: 1 });
    await eventually(() => heater.on, 5000, "the heater on");
    await eventually(() => !controller.plug(gone.slug, "heater-1")?.pending, 5000, "the switch acknowledged");
    // …and readings of a house that stays.
    await keptSensor.publishAsync(sensorTopic(kept.slug, "air-1"), reading(kept, 11), { qos: 1 });
    expect(controller.stats().switchesUnwritten).toBeGreaterThan(0);
    expect(controller.stats().readingsUnwritten).toBeGreaterThanOrEqual(2);

    await direct.db.delete(houses).where(eq(houses.id, gone.houseId));
    proxy.restore();

    await eventually(async () => {
      await controller.flush();
      const stats = controller.stats();
      return stats.switchesUnwritten === 0 && stats.readingsUnwritten === 0;
    }, 15_000, "nothing left waiting");
    const keptReadings = await direct.db.select().from(readings).where(eq(readings.sensorId, kept.sensorId));
    expect(keptReadings.map((r) => r.tempC)).toContain(11);
    expect(await direct.db.select().from(switchEvents).where(eq(switchEvents.plugId, gone.heaterId))).toEqual([]);

    // Later rows go through at once, not after a back-off.
    await keptSensor.publishAsync(sensorTopic(kept.slug, "air-1"), reading(kept, 11.5), { qos: 1 });
    await eventually(async () => {
      await controller.flush();
      const rows = await direct.db.select().from(readings).where(eq(readings.sensorId, kept.sensorId));
      return rows.some((r) => r.tempC === 11.5);
    }, 5000, "a later reading stored");
  }, 40_000);
});
