// Fresh MQTT credentials for the demo site's simulated devices on every start: the
// hashes go to MariaDB, the secrets to a file only the simulator reads.
import { writeFileSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import type { Database } from "../db/client";
import { issueDeviceCredential } from "../db/device-credentials";
import { plugs, sensors, sites } from "../db/schema";
import { dataFolder } from "./common";

export const DEVICE_SECRETS_FILE = path.join(dataFolder, "device-secrets.json");

export async function issueDemoDeviceSecrets(db: Database, siteSlug: string, file = DEVICE_SECRETS_FILE) {
  const [site] = await db.select({ id: sites.id, slug: sites.slug }).from(sites).where(eq(sites.slug, siteSlug));
  if (!site) throw new Error(`no site ${siteSlug} to issue device credentials for`);
  const devices = [
    ...(await db.select({ deviceId: plugs.deviceId }).from(plugs).where(eq(plugs.siteId, site.id))).map((d) => ({ ...d, kind: "plug" as const })),
    ...(await db.select({ deviceId: sensors.deviceId }).from(sensors).where(eq(sensors.siteId, site.id))).map((d) => ({ ...d, kind: "sensor" as const })),
  ];
  const secrets: Record<string, string> = {};
  for (const device of devices) {
    const { username, secret } = await issueDeviceCredential(db, { siteId: site.id, siteSlug: site.slug, kind: device.kind, deviceId: device.deviceId });
    secrets[username] = secret;
  }
  writeFileSync(file, JSON.stringify(secrets, null, 2) + "\n", { mode: 0o600 });
  return devices.length;
}
