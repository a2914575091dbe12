// What the simulation needs to know about a site: its houses, plugs and sensors (from
// MariaDB) and the devices' MQTT secrets (from the file the credentials step writes).
import { readFile } from "node:fs/promises";
import { asc, eq } from "drizzle-orm";
import { z } from "zod";
import type { Database } from "../db/client";
import { houses, plugs, sensors, sites } from "../db/schema";
import type { ApplianceKind, SensorPlacement } from "../lib/domain";
import type { HouseShape } from "../lib/thermal/heat-loss";

export type LayoutHouse = { id: string; name: string; shape: HouseShape };
export type LayoutPlug = {
  id: string;
  houseId: string;
  deviceId: string;
  applianceKind: ApplianceKind;
  applianceWatts: number;
  /** The plug's own fall-back when a lease runs out: on only when configured "on". */
  failsafeOn: boolean;
  metersEnergy: boolean;
};
/** An "outside" sensor reads the weather; an "inside" one its house's air. */
export type LayoutSensor = { id: string; houseId: string; deviceId: string; placement: SensorPlacement };

export type SiteLayout = {
  site: { id: string; slug: string; timeZone: string };
  houses: LayoutHouse[];
  plugs: LayoutPlug[];
  sensors: LayoutSensor[];
};

export async function loadSiteLayout(db: Database, slug: string): Promise<SiteLayout> {
  const [site] = await db
    .select({ id: sites.id, slug: sites.slug, timeZone: sites.timeZone })
    .from(sites)
    .where(eq(sites.slug, slug));
  if (!site) throw new Error(`no site with slug ${JSON.stringify(slug)} (has the demo been seeded?)`);
  const [houseRows, plugRows, sensorRows] = await Promise.all([
    db.select().from(houses).where(eq(houses.siteId, site.id)).orderBy(asc(houses.name)),
    db.select().from(plugs).where(eq(plugs.siteId, site.id)).orderBy(asc(plugs.deviceId)),
    db.select().from(sensors).where(eq(sensors.siteId, site.id)).orderBy(asc(sensors.deviceId)),
  ]);
  return {
    site,
    houses: houseRows.map((h) => ({
      id: h.id,
      name: h.name,
      shape: {
        kind: h.kind,
        lengthM: Number(h.lengthM),
        widthM: Number(h.widthM),
        eaveHeightM: Number(h.eaveHeightM),
        ridgeHeightM: Number(h.ridgeHeightM),
        glazing: h.glazing,
        airChangesPerHour: Number(h.airChangesPerHour),
      },
    })),
    plugs: plugRows.map((p) => ({
      id: p.id,
      houseId: p.houseId,
      deviceId: p.deviceId,
      applianceKind: p.applianceKind,
      applianceWatts: p.applianceWatts,
      failsafeOn: p.failsafe === "on",
      metersEnergy: p.metersEnergy,
    })),
    sensors: sensorRows.map((s) => ({ id: s.id, houseId: s.houseId, deviceId: s.deviceId, placement: s.placement })),
  };
}

const secretsFile = z.record(z.string().min(1), z.string().min(1));

/** `{ "<mqtt username>": "<secret>" }`. */
export async function readDeviceSecrets(file: string): Promise<Record<string, string>> {
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch (error) {
    throw new Error(`cannot read the device secrets at ${file} (written when device credentials are issued): ${(error as Error).message}`);
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    throw new Error(`${file} is not JSON`);
  }
  const result = secretsFile.safeParse(parsed);
  if (!result.success) throw new Error(`${file} must be an object of user name → secret strings`);
  return result.data;
}
