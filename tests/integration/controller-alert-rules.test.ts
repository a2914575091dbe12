// A house's alert rules, evaluated by the controller as readings arrive, against the
// real MariaDB, the embedded broker and a simulated heater. The controller's clock is
// the test's, so minutes pass at once.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { alerts, houseAlertRules } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startPlugDevice, type PlugDevice } from "@/fakes/plug-device";
import { alertDetailFrom } from "@/lib/alerts/detail";
import { DEFAULT_ALERT_RULES, type AlertRules } from "@/lib/alerts/rules";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { connectAs, createControlSite, eventually, startTestHeater, testControllerOptions, type ControlSite } from "../support/control-site";

const MIN = 60_000;
let clock = Date.parse("2026-01-12T03:00:00Z");
let site: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let sensor: MqttClient;

// The test house's frost limit is the houses table's default, 2 °C. Rules that only
// plugs could trip while the clock jumps ahead of the simulated heater are off here.
const rules: AlertRules = {
  ...DEFAULT_ALERT_RULES,
  frost: { belowC: null, holdMin: 2 },
  hysteresisK: 0.5,
  sensorSilent: { enabled: true, afterMin: 5 },
  condensation: { ...DEFAULT_ALERT_RULES.condensation, dewMarginK: 1, holdMin: 1 },
  plugOffline: { enabled: false, afterMin: 5 },
  plugMismatch: { enabled: false, afterMin: 3 },
  heaterLongOn: { enabled: false, afterHours: 12 },
};

/** A reading as the sensor sends it, `minutes` after the last one on the test's clock. */
async function send(minutes: number, tempC: number, rh = 60, battery = 0.9) {
  clock += minutes * MIN;
  await sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, rh, battery, at: new Date(clock).toISOString() }), { qos: 1 });
}

async function rowsOf(kind: (typeof alerts.$inferSelect)["kind"]) {
  return getDb()
    .select()
    .from(alerts)
    .where(and(eq(alerts.siteId, site.siteId), eq(alerts.kind, kind)))
    .orderBy(asc(alerts.id));
}

/** Lets what was sent be handled and written; for checks that something did not happen. */
const settle = () => new Promise((resolve) => setTimeout(resolve, 400));

beforeAll(async () => {
  // The heater judges its sensor stale only after an hour, so silence here is the rule's, not the fail-safe's.
  site = await createControlSite(getDb(), { staleAfterS: 3600 });
  await getDb().insert(houseAlertRules).values({ houseId: site.houseId, rules });
  controller = await createController(testControllerOptions(site, { now: () => clock }));
  heater = await startTestHeater(site, controller.mqttUrl);
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
});

afterAll(async () => {
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
});

describe("the controller's alert rules", () => {
  it("raises frost risk once after its minimum duration, holds it through a flapping reading, and closes it on recovery", async () => {
    await send(0, 1.5);
    await send(1, 1.4);
    await settle();
    expect(await rowsOf("too_cold")).toEqual([]);

    await send(1, 1.3); // two minutes at or below 2 °C
    const [raised] = await eventually(async () => {
      const rows = await rowsOf("too_cold");
      return rows.length ? rows : undefined;
    }, 5000, "frost risk raised");
    expect(raised).toMatchObject({ sensorId: site.sensorId, houseId: site.houseId, plugId: null, clearedAt: null });
    expect(raised!.message).toBe("Frost risk in Test house: Air is at or below the frost alert temperature.");
    expect(alertDetailFrom(raised!.detail)).toMatchObject({ valueC: 1.3, limitC: 2, hysteresisK: 0.5, lastedMin: 2, houseName: "Test house", sensorName: "Air" });

    // Colder still, then hovering around the limit within the 0.5 K hysteresis.
    for (const t of [1.0, 0.8, 2.3, 1.9, 2.5, 2.0, 2.4]) await send(0.5, t);
    await settle();
    const during = await rowsOf("too_cold");
    expect(during).toHaveLength(1);
    expect(during[0]!.clearedAt).toBeNull();

    await send(0.5, 2.6);
    const cleared = await eventually(async () => {
      const rows = await rowsOf("too_cold");
      return rows[0]?.clearedAt ? rows : undefined;
    }, 5000, "frost risk cleared");
    expect(cleared).toHaveLength(1);
    expect(cleared[0]!.clearedMessage).toBe("Air in Test house is above the frost alert temperature again.");
    const detail = alertDetailFrom(cleared[0]!.detail);
    expect(detail.valueC).toBe(1.3);
    expect(detail.cleared).toMatchObject({ valueC: 2.6, rh: 60, batteryPercent: 90, at: new Date(clock).toISOString() });

    await send(0.5, 2.2);
    await settle();
    expect(await rowsOf("too_cold")).toHaveLength(1);
  });

  it("raises battery low below its level and closes it five points above", async () => {
    await send(0.5, 8, 60, 0.1);
    const [low] = await eventually(async () => {
      const rows = await rowsOf("battery_low");
      return rows.length ? rows : undefined;
    }, 5000, "battery low");
    expect(low!.message).toBe("Air in Test house needs a new battery soon.");
    expect(alertDetailFrom(low!.detail)).toMatchObject({ batteryPercent: 10, limitPercent: 15 });
    await send(0.5, 8, 60, 0.18);
    await settle();
    expect((await rowsOf("battery_low"))[0]!.clearedAt).toBeNull();
    await send(0.5, 8, 60, 0.25);
    await eventually(async () => (await rowsOf("battery_low"))[0]?.clearedAt, 5000, "battery good again");
    expect(await rowsOf("battery_low")).toHaveLength(1);
  });

  it("raises condensation risk when the air stays within a degree of its dew point", async () => {
    // 10 °C at 95 % RH: dew point 9.24 °C by the Magnus form (Alduchov & Eskridge 1996), 0.76 K away.
    await send(0.5, 10, 95);
    await send(1, 10, 95);
    const [risk] = await eventually(async () => {
      const rows = await rowsOf("condensation");
      return rows.length ? rows : undefined;
    }, 5000, "condensation risk");
    expect(risk!.message).toBe("Condensation risk in Test house: the air is close to its dew point at Air.");
    const detail = alertDetailFrom(risk!.detail);
    expect(detail).toMatchObject({ condensation: "near_dew_point", valueC: 10, rh: 95 });
    expect(detail.dewPointC).toBeCloseTo(9.24, 1);
    // 20 °C at 50 % RH: dew point about 9.3 °C (../shared/REFERENCES.md), far away.
    await send(0.5, 20, 50);
    await eventually(async () => (await rowsOf("condensation"))[0]?.clearedMessage, 5000, "condensation cleared");
  });

  it("raises sensor silence after the rule's minutes without a reading, and a reading closes it", async () => {
    // Before the first reading the heater's fail-safe found its sensor quiet; that first reading closed it.
    const earlier = await rowsOf("sensor_quiet");
    expect(earlier.every((r) => r.clearedAt !== null)).toBe(true);
    const since = async () => (await rowsOf("sensor_quiet")).slice(earlier.length);

    await send(0.5, 12);
    clock += 4 * MIN;
    await settle();
    expect(await since()).toEqual([]);
    clock += 1 * MIN + 1000;
    const [silent] = await eventually(async () => {
      const rows = await since();
      return rows.length ? rows : undefined;
    }, 5000, "sensor silent");
    expect(silent).toMatchObject({ sensorId: site.sensorId, houseId: site.houseId });
    expect(silent!.message).toBe("Air in Test house has gone silent: no reading has come in for longer than its limit.");
    expect(alertDetailFrom(silent!.detail).lastedMin).toBeGreaterThanOrEqual(5);

    await send(0, 12);
    const [back] = await eventually(async () => {
      const rows = await since();
      return rows[0]?.clearedAt ? rows : undefined;
    }, 5000, "silence closed by a reading");
    expect(back!.clearedMessage).toBe("Air in Test house is reporting again.");
  });

  it("applies a rule saved in the house's alert rules as soon as the site is reloaded", async () => {
    await send(0.5, 4);
    await settle();
    expect((await rowsOf("too_cold")).filter((r) => r.clearedAt === null)).toEqual([]);

    await getDb()
      .update(houseAlertRules)
      .set({ rules: { ...rules, frost: { belowC: 5, holdMin: 0 } } })
      .where(eq(houseAlertRules.houseId, site.houseId));
    await controller.reload(site.slug);
    // No new reading: the latest one is taken through the new rule at once.
    const open = await eventually(async () => {
      const rows = (await rowsOf("too_cold")).filter((r) => r.clearedAt === null);
      return rows.length ? rows : undefined;
    }, 5000, "frost risk under the new limit");
    expect(alertDetailFrom(open[0]!.detail)).toMatchObject({ valueC: 4, limitC: 5 });
  });

  it("raises a plug offline once it has not been heard for the rule's minutes, and closes it when it comes online", async () => {
    // The light has no device running: nothing has been heard from it since the controller started.
    await getDb()
      .update(houseAlertRules)
      .set({ rules: { ...rules, plugOffline: { enabled: true, afterMin: 1 } } })
      .where(eq(houseAlertRules.houseId, site.houseId));
    await controller.reload(site.slug);
    // Unheard for the rule's minute on top of the third of its 30 s lease it is given to answer a refresh.
    clock += MIN + 10_000 + 1000;
    const offline = await eventually(async () => {
      const rows = (await rowsOf("plug_offline")).filter((r) => r.plugId === site.lightId);
      return rows.length ? rows : undefined;
    }, 5000, "light offline");
    expect(offline).toHaveLength(1);
    expect(offline[0]!.message).toBe("Light in Test house is offline or has not been heard from.");

    const light = await startPlugDevice({
      url: controller.mqttUrl,
      site: site.slug,
      device: "light-1",
      password: site.secret("plug", "light-1"),
      ratedW: 100,
      failsafeOn: false,
      tickMs: 100,
      reportEveryMs: 0,
    });
    try {
      clock += 6000;
      const back = await eventually(async () => {
        const rows = (await rowsOf("plug_offline")).filter((r) => r.plugId === site.lightId);
        return rows[0]?.clearedAt ? rows : undefined;
      }, 5000, "light online again");
      expect(back).toHaveLength(1);
      expect(back[0]!.clearedMessage).toBe("Light in Test house is online again.");
    } finally {
      await light.close();
    }
  });

  it("gives every sensor its full silence limit after a restart, however old its last reading", async () => {
    const openQuiet = async () => (await rowsOf("sensor_quiet")).filter((r) => r.clearedAt === null);
    expect(await openQuiet()).toEqual([]);
    await controller.close();
    // The controller was down for half an hour: nobody listened, so that is not the sensor's silence
    // (the heater judges its reading stale only after an hour, so its fail-safe stays out of this).
    clock += 30 * MIN;
    controller = await createController(testControllerOptions(site, { now: () => clock }));
    for (let i = 0; i < 5; i++) {
      clock += 30_000;
      await settle();
    }
    expect(await openQuiet()).toEqual([]);
    clock += 3 * MIN; // past the rule's 5 minutes since the restart
    await eventually(async () => (await openQuiet()).length === 1 || undefined, 5000, "silence after the restart's limit");
  });
});
