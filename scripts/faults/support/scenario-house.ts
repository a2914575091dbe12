// A house of the scenario's own in the demo site, made through the web app as the
// owner (so every change wakes the controller, as a person's would): one sensor, one
// heater plug that follows it with frost protection outside windows, and a fresh MQTT
// secret for each. Removed again at the end, with its devices and their switch log.
import { randomBytes } from "node:crypto";
import type { FaultContext } from "../scenario";
import { lastReadingId, openDb } from "./db";
import { sleep, waitFor } from "./devices";
import { call, expectCall, signIn, type Session } from "./http";

export const DEMO_OWNER = { email: "owner@fernhollow.example", password: "fernhollow-owner" };

export type ScenarioHouse = {
  siteId: string;
  site: string;
  houseId: string;
  sensor: { id: string; deviceId: string; secret: string };
  plug: { id: string; deviceId: string; secret: string };
  owner: Session;
  /** Removes the house (once); gives a failure when the site's readings stop being stored after it. */
  remove: () => Promise<string[]>;
};

export type HeaterSettings = {
  failsafe?: "off" | "on" | "duty";
  staleAfterS?: number;
  frostLowC?: number;
  frostHighC?: number;
  leaseS?: number;
};

export async function makeScenarioHouse(
  context: FaultContext,
  demo: { id: string; slug: string },
  label: string,
  settings: HeaterSettings = {},
): Promise<ScenarioHouse> {
  const owner = await signIn(context.url, DEMO_OWNER.email, DEMO_OWNER.password);
  const tag = `${label}-${randomBytes(3).toString("hex")}`;
  const base = `/api/sites/${demo.id}`;
  const { house } = (await expectCall(context.url, owner, "POST", `${base}/houses`, {
    name: `Fault test ${tag}`.slice(0, 80),
    kind: "polytunnel",
    lengthM: 6,
    widthM: 3,
    eaveHeightM: 1.8,
    ridgeHeightM: 2.6,
    glazing: "single_film",
  }, 201)) as { house: { id: string } };
  let removed = false;
  const remove = async (): Promise<string[]> => {
    if (removed) return [];
    removed = true;
    // Readings are written in batches about once a second: let the last ones land first.
    await sleep(2500);
    const db = openDb(context.databaseUrl);
    try {
      const lastId = await lastReadingId(db);
      const answer = await call(context.url, owner, "DELETE", `${base}/houses/${house.id}`);
      if (answer.status !== 204) return [`could not remove the scenario house (${answer.status}): ${answer.text.slice(0, 200)}`];
      // The demo's sensors report every few seconds: their readings must go on being stored.
      const flowing = await waitFor(async () => (await lastReadingId(db)) > lastId, 20_000);
      return flowing ? [] : ["no reading of any sensor was stored in the 20 s after the scenario house was removed"];
    } finally {
      await db.end();
    }
  };
  try {
    const { sensor } = (await expectCall(context.url, owner, "POST", `${base}/sensors`, { name: `Air ${tag}`, deviceId: `fault-air-${tag}`, houseId: house.id }, 201)) as {
      sensor: { id: string; deviceId: string };
    };
    const { plug } = (await expectCall(context.url, owner, "POST", `${base}/plugs`, {
      name: `Heater ${tag}`,
      deviceId: `fault-heat-${tag}`,
      houseId: house.id,
      applianceKind: "heater",
      applianceWatts: 1000,
      ratedCurrentA: 13,
      sensorId: sensor.id,
      failsafe: settings.failsafe ?? "off",
      staleAfterS: settings.staleAfterS ?? 900,
      minOnS: 0,
      minOffS: 0,
      leaseS: settings.leaseS ?? 900,
    }, 201)) as { plug: { id: string; deviceId: string } };
    await expectCall(context.url, owner, "PUT", `${base}/plugs/${plug.id}/schedule`, {
      name: `Frost only ${tag}`.slice(0, 80),
      windows: [],
      outsideWindows: "frost",
      frostLowC: settings.frostLowC ?? 8,
      frostHighC: settings.frostHighC ?? 10,
      validFrom: null,
      validUntil: null,
      skipDays: [],
    }, 200);
    const secretOf = async (kind: "plug" | "sensor", id: string) =>
      ((await expectCall(context.url, owner, "POST", `${base}/devices/${kind}/${id}/credential`, {}, 201)) as { secret: string }).secret;
    return {
      siteId: demo.id,
      site: demo.slug,
      houseId: house.id,
      sensor: { id: sensor.id, deviceId: sensor.deviceId, secret: await secretOf("sensor", sensor.id) },
      plug: { id: plug.id, deviceId: plug.deviceId, secret: await secretOf("plug", plug.id) },
      owner,
      remove,
    };
  } catch (error) {
    await remove();
    throw error;
  }
}
