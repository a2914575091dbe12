// The controller keeps the energy roll-up behind its switch log: a heater it switches
// on and off shows in energy_days with the runtime its log says, and a metering plug's
// counter is kept as samples that become metered energy.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { energyDays, meterSamples, switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { connectAs, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";

let site: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let sensor: MqttClient;
let feeding: NodeJS.Timeout | undefined;

function feed(tempC: number) {
  clearInterval(feeding);
  const publish = () => sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, at: new Date().toISOString() }), { qos: 1 }).catch(() => undefined);
  void publish();
  feeding = setInterval(() => void publish(), 200);
}

beforeAll(async () => {
  site = await createControlSite(getDb(), { metersEnergy: true });
  controller = await createController(testControllerOptions(site, { startupGraceMs: 0, energyRollupMs: 50, meterSampleMs: 100 }));
  heater = await startPlugDevice({
    url: controller.mqttUrl,
    site: site.slug,
    device: "heater-1",
    password: site.secret("plug", "heater-1"),
    ratedW: 2000,
    failsafeOn: false,
    tickMs: 50,
    reportEveryMs: 100,
  });
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
});

afterAll(async () => {
  clearInterval(feeding);
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
});

describe("the controller's energy roll-up", () => {
  it("holds the runtime of the switches it logged, and the metering plug's samples", async () => {
    feed(8); // below the band's 10 °C low edge: heat
    await eventually(async () => {
      await controller.flush();
      const rows = await getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId));
      return rows.some((r) => r.toOn && r.ackAt);
    }, 5000, "heater on");
    await new Promise((resolve) => setTimeout(resolve, 600));
    feed(13); // above the 12 °C high edge: off
    const log = await eventually(async () => {
      await controller.flush();
      const rows = await getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId)).orderBy(asc(switchEvents.at), asc(switchEvents.id));
      const lastOn = rows.findLastIndex((r) => r.toOn && !r.withdrawnAt);
      return lastOn >= 0 && rows.slice(lastOn + 1).some((r) => !r.toOn && !r.withdrawnAt) ? rows : undefined;
    }, 5000, "heater off again");

    // What the log says: the sum of its closed on-intervals, at the rated watts.
    let expectedMs = 0;
    let onAt: number | null = null;
    for (const r of log.filter((e) => !e.withdrawnAt)) {
      if (onAt !== null) expectedMs += r.at.getTime() - onAt;
      onAt = r.toOn ? r.at.getTime() : null;
    }
    expect(expectedMs).toBeGreaterThan(400);
    expect(log.filter((e) => e.toOn).every((e) => e.ratedWatts === 2000)).toBe(true);

    const rows = await eventually(async () => {
      await controller.flush();
      const found = await getDb().select().from(energyDays).where(eq(energyDays.plugId, site.heaterId));
      return found.reduce((s, r) => s + r.onMs, 0) === expectedMs ? found : undefined;
    }, 5000, "roll-up caught up");
    expect(rows.reduce((s, r) => s + r.ratedWattMs, 0)).toBe(expectedMs * 2000);
    const samples = await getDb().select().from(meterSamples).where(eq(meterSamples.plugId, site.heaterId));
    expect(samples.length).toBeGreaterThan(2);
    expect(rows.some((r) => r.meteredWs !== null)).toBe(true);
  });
});
