import "server-only";
import { getDb } from "@/db/client";
import { replaceDeviceCredential, revokeDeviceCredentials } from "@/db/device-credentials";
import { AppError } from "@/lib/errors";
import type { DeviceKind } from "@/lib/mqtt/topics";
import { recordAudit } from "./audit";
import { assertNotRetired, type DeviceOfSite } from "./devices";

type Args = { site: { id: string; slug: string }; kind: DeviceKind; device: DeviceOfSite; userId: string };

/** A new MQTT secret for a working device, audited (never the secret itself); the earlier one stops working. */
export async function issueCredential({ site, kind, device, userId }: Args) {
  assertNotRetired(device, kind);
  return getDb().transaction(async (tx) => {
    const credential = await replaceDeviceCredential(tx, { siteId: site.id, siteSlug: site.slug, kind, deviceId: device.deviceId });
    await recordAudit(tx, {
      siteId: site.id,
      userId,
      action: "credential.issue",
      entityType: kind,
      entityId: device.id,
      after: { username: credential.username },
    });
    return credential;
  });
}

/** The device's secret stops working; 409 when it has none active. */
export async function revokeCredential({ site, kind, device, userId }: Args) {
  const at = new Date();
  await getDb().transaction(async (tx) => {
    const revoked = await revokeDeviceCredentials(tx, { siteId: site.id, kind, deviceId: device.deviceId }, at);
    if (revoked === 0) throw new AppError("conflict", `The ${kind} “${device.name}” has no active credential to revoke.`);
    await recordAudit(tx, {
      siteId: site.id,
      userId,
      action: "credential.revoke",
      entityType: kind,
      entityId: device.id,
      before: { active: true },
      after: { active: false, revokedAt: at },
    });
  });
  return { revokedAt: at };
}
