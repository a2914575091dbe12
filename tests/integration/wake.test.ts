// A change made through a route handler reaches the plug at once: the handler wakes
// the site's controller after its transaction commits, while the controller's own
// periodic reload is an hour away.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { issueDeviceCredential } from "@/db/device-credentials";
import { deviceCredentials, memberships, scheduleWindows, schedules, switchEvents } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import type { PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { setWakeBroker, wakeController } from "@/lib/server/wake";
import * as houseRoute from "@/app/api/sites/[siteId]/houses/[houseId]/route";
import { connectAs, createControlSite, eventually, testControllerOptions, startTestHeater, type ControlSite } from "../support/control-site";
import { call, signUp, type Account } from "../support/http";

let site: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let sensor: MqttClient;
let grower: Account;

beforeAll(async () => {
  const db = getDb();
  // A quiet sensor must not be what switches the heater here.
  site = await createControlSite(db, { staleAfterS: 3600, failsafe: "off" });
  // The heater's band is 20–25 °C, so at 18 °C it is on, below a 30 °C high limit.
  const [schedule] = await db.select({ id: schedules.id }).from(schedules).where(eq(schedules.plugId, site.heaterId));
  await db.update(scheduleWindows).set({ lowC: 20, highC: 25 }).where(eq(scheduleWindows.scheduleId, schedule!.id));
  grower = await signUp();
  await db.insert(memberships).values({ siteId: site.siteId, userId: grower.userId, role: "grower" });

  const options = testControllerOptions(site, { configReloadMs: 3600_000 });
  controller = await createController(options);
  await setWakeBroker({ url: controller.mqttUrl, secret: options.webappSecret });
  heater = await startTestHeater(site, controller.mqttUrl);
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  await sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: 18, rh: 80, at: new Date().toISOString() }), { qos: 1 });
  await eventually(() => heater.on, 5000, "heater on below its band");
});

afterAll(async () => {
  await setWakeBroker(null);
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
});

describe("a change that affects control", () => {
  it("lowering the house's high limit below the reading switches the heater off within 1 s", async () => {
    const started = Date.now();
    const response = await call(houseRoute.PATCH, {
      method: "PATCH",
      path: `/api/sites/${site.siteId}/houses/${site.houseId}`,
      params: { siteId: site.siteId, houseId: site.houseId },
      body: { highLimitC: 15 },
      cookie: grower.cookie,
    });
    expect(response.status).toBe(200);
    await eventually(() => !heater.on, 1000 - (Date.now() - started), "heater off within 1 s of the change");
    expect(Date.now() - started).toBeLessThan(1000);

    await controller.flush();
    const [last] = await getDb()
      .select()
      .from(switchEvents)
      .where(eq(switchEvents.plugId, site.heaterId))
      .orderBy(asc(switchEvents.id))
      .then((rows) => rows.slice(-1));
    expect(last).toMatchObject({ fromOn: true, toOn: false, cause: "safety", readingTempC: 18 });
  });

  it("a device whose credential is revoked is signed out at the site's wake-up, and cannot sign in again", async () => {
    const { username, secret } = await issueDeviceCredential(getDb(), { siteId: site.siteId, siteSlug: site.slug, kind: "sensor", deviceId: "air-2" });
    const other = await connectAs(controller.mqttUrl, username, secret);
    const closed = new Promise<void>((resolve) => other.once("close", () => resolve()));
    await getDb().update(deviceCredentials).set({ revokedAt: new Date() }).where(eq(deviceCredentials.username, username));
    // Signed in before the revocation; a wake-up for another reason leaves it alone until then.
    expect(other.connected).toBe(true);
    expect(await wakeController(site.slug, { reason: "device" })).toBe(true);
    await closed;
    // The sensor of the first test, whose credential stands, is still connected.
    expect(sensor.connected).toBe(true);
    await expect(connectAs(controller.mqttUrl, username, secret)).rejects.toThrow(/Bad username or password/);
    await other.endAsync(true);
  });

  it("a broker that is away does not fail or hold up the request's wake-up", async () => {
    await setWakeBroker({ url: "mqtt://127.0.0.1:1", secret: "x".repeat(32) });
    const started = Date.now();
    expect(await wakeController(site.slug, { reason: "house" })).toBe(false);
    expect(Date.now() - started).toBeLessThan(200);
    await setWakeBroker(null);
  });
});
