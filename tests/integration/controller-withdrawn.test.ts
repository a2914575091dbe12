// A switch the plug never confirmed, replaced by a newer decision, is withdrawn in the
// log: the houses overview and a restarted controller take the plug to be as it was.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { switchEvents } from "@/db/schema";
import { getSiteLive } from "@/db/queries/live";
import { createController, type Controller, type ControllerOptions } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { connectAs, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";

let site: ControlSite;
let controller: Controller;
let heater: PlugDevice | undefined;
let sensor: MqttClient;

const startHeater = () =>
  startPlugDevice({ url: controller.mqttUrl, site: site.slug, device: "heater-1", password: site.secret("plug", "heater-1"), ratedW: 2000, failsafeOn: false, tickMs: 100, reportEveryMs: 0 });
const startController = (extra: Partial<ControllerOptions> = {}) => createController(testControllerOptions(site, { startupGraceMs: 0, ...extra }));
const publishReading = (tempC: number) =>
  sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, at: new Date().toISOString() }), { qos: 1 });
// The sensor goes quiet after 2 s (and the heater to its fail-safe): keep it talking.
let temperature = 12.5;
let feeding: NodeJS.Timeout | undefined;
async function setTemperature(tempC: number) {
  temperature = tempC;
  clearInterval(feeding);
  await publishReading(tempC);
  feeding = setInterval(() => void publishReading(temperature).catch(() => undefined), 200);
}

/** A new controller, with a broker of its own on a new port; the sensor joins it. */
async function restart(extra: Partial<ControllerOptions>) {
  clearInterval(feeding);
  await sensor.endAsync();
  await controller.close();
  controller = await startController(extra);
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  await setTemperature(temperature);
}

/** Each switch that happened starts from the state the one before it ended in. */
function expectChain(events: (typeof switchEvents.$inferSelect)[]) {
  const happened = events.filter((e) => !e.withdrawnAt);
  for (let i = 1; i < happened.length; i++) expect(happened[i]!.fromOn, `row ${happened[i]!.id}`).toBe(happened[i - 1]!.toOn);
}

async function heaterEvents() {
  await controller.flush();
  return getDb().select().from(switchEvents).where(eq(switchEvents.plugId, site.heaterId)).orderBy(asc(switchEvents.id));
}

beforeAll(async () => {
  site = await createControlSite(getDb());
  controller = await startController();
  heater = await startHeater();
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
});

afterAll(async () => {
  clearInterval(feeding);
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
});

describe("a switch replaced before the plug confirmed it", () => {
  it("is withdrawn, and the overview still shows the plug as it was", async () => {
    // Warm (above the band's 12 °C high edge): the heater is and stays off.
    // (Until then the sensor is quiet, and the heater's fail-safe is on.)
    await setTemperature(12.5);
    const settled = await eventually(async () => {
      const events = await heaterEvents();
      return events.at(-1)?.toOn === false && events.at(-1)?.ackAt ? events : undefined;
    }, 5000, "heater known off");
    // The plug drops off the network; a cold reading asks for heat it cannot hear.
    await heater!.close();
    heater = undefined;
    await setTemperature(8);
    const sent = await eventually(async () => (await heaterEvents()).slice(settled.length).find((e) => e.toOn), 5000, "switch on sent");
    expect(sent.ackAt).toBeNull();
    // Warm again before it ever answered: the switch on is replaced by "stay off".
    await setTemperature(12.5);
    const withdrawn = await eventually(
      async () => (await getDb().select().from(switchEvents).where(and(eq(switchEvents.commandId, sent.commandId)))).find((e) => e.withdrawnAt),
      5000,
      "switch withdrawn",
    );
    expect(withdrawn.ackAt).toBeNull();
    expect(withdrawn.withdrawnAt!.getTime()).toBeGreaterThanOrEqual(sent.at.getTime());

    const live = await getSiteLive({ siteId: site.siteId });
    const plug = live.plugs.find((p) => p.plugId === site.heaterId);
    expect(plug).toMatchObject({ on: false, acknowledged: true });
    expectChain(await heaterEvents());
  });

  it("is not taken as the plug's state by a controller that starts afterwards", async () => {
    const before = await heaterEvents();
    // It waits for the heater's report (the grace) while the sensor speaks again.
    await restart({ startupGraceMs: 10_000 });
    // Back on the network, still off: that agrees with the log, so nothing new is logged.
    heater = await startHeater();
    await eventually(() => controller.plug(site.slug, "heater-1")?.last?.on === false, 5000, "decided off");
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect((await heaterEvents()).map((e) => e.id)).toEqual(before.map((e) => e.id));
  });

  it("is withdrawn when the plug turns up where it was taking it by itself; that change is logged once, and the overview says what keeps it so now", async () => {
    // Retries far off, so the command cannot reach the plug before its first report does.
    await heater!.close();
    await restart({ ackTimeoutMs: 60_000 });
    heater = await startHeater();
    await setTemperature(8);
    await eventually(async () => (await heaterEvents()).at(-1)?.ackAt && heater?.on, 5000, "heater on");
    const before = await heaterEvents();
    // Off the network while on; a warm reading sends "off", unheard.
    await heater!.close();
    heater = undefined;
    await setTemperature(12.5);
    const sent = await eventually(async () => (await heaterEvents()).slice(before.length).find((e) => !e.toOn), 5000, "switch off sent");
    // It comes back on its own fail-safe, off: where the switch was taking it.
    heater = await startHeater();
    const observed = await eventually(
      async () => (await heaterEvents()).slice(before.length).find((e) => e.commandId.startsWith("observed-")),
      5000,
      "change observed",
    );
    expect(observed).toMatchObject({ fromOn: true, toOn: false, cause: "plug_fallback" });
    const after = (await heaterEvents()).slice(before.length);
    expect(after.map((e) => e.id)).toEqual([sent.id, observed.id]);
    expect(after[0]!.withdrawnAt).not.toBeNull();
    expectChain(await heaterEvents());
    // Its last switch was the fail-safe's, but what keeps it off now is its band.
    const plug = await eventually(async () => {
      await controller.flush();
      const live = (await getSiteLive({ siteId: site.siteId })).plugs.find((p) => p.plugId === site.heaterId);
      return live?.presentCause === "schedule" ? live : undefined;
    }, 5000, "held off by the schedule");
    expect(plug).toMatchObject({ on: false, cause: "plug_fallback", presentCause: "schedule", acknowledged: true });
  });
});
