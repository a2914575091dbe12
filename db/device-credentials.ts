// Device credentials: issued to a device (the secret is shown once), stored hashed.
import { and, eq, inArray, isNull } from "drizzle-orm";
import type { Database } from "@/db/client";
import { deviceCredentials } from "@/db/schema";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { hashDeviceSecret, newDeviceSecret } from "@/lib/server/device-secrets";
import type { DeviceKind } from "@/lib/mqtt/topics";

/** A device's current (not revoked) credential, or null. */
export async function findDeviceCredential(db: Database, username: string): Promise<{ siteId: string; username: string; secretHash: string } | null> {
  const [row] = await db
    .select({ siteId: deviceCredentials.siteId, username: deviceCredentials.username, secretHash: deviceCredentials.secretHash })
    .from(deviceCredentials)
    .where(and(eq(deviceCredentials.username, username), isNull(deviceCredentials.revokedAt)))
    .limit(1);
  return row ?? null;
}

export async function lookupDeviceSecret(db: Database, username: string): Promise<string | null> {
  return (await findDeviceCredential(db, username))?.secretHash ?? null;
}

/** The current (not revoked) credentials of the given sites' devices, for the controller to hold in memory. */
export async function loadDeviceCredentials(db: Database, siteIds: string[]): Promise<{ siteId: string; username: string; secretHash: string }[]> {
  if (siteIds.length === 0) return [];
  return db
    .select({ siteId: deviceCredentials.siteId, username: deviceCredentials.username, secretHash: deviceCredentials.secretHash })
    .from(deviceCredentials)
    .where(and(inArray(deviceCredentials.siteId, siteIds), isNull(deviceCredentials.revokedAt)));
}

type Writer = Pick<Database, "insert" | "delete" | "update">;
type DeviceRef = { siteId: string; siteSlug: string; kind: DeviceKind; deviceId: string };

/** Inside the caller's transaction: a new secret for a device, replacing any earlier one. Returns the secret, once. */
export async function replaceDeviceCredential(tx: Writer, device: DeviceRef): Promise<{ username: string; secret: string }> {
  const username = deviceUsername(device.siteSlug, device.kind, device.deviceId);
  const secret = newDeviceSecret();
  await tx.delete(deviceCredentials).where(eq(deviceCredentials.username, username));
  await tx.insert(deviceCredentials).values({
    siteId: device.siteId,
    deviceKind: device.kind,
    deviceId: device.deviceId,
    username,
    secretHash: hashDeviceSecret(secret),
  });
  return { username, secret };
}

/** A new secret for a device; any earlier one stops working. Returns the secret, once. */
export async function issueDeviceCredential(db: Database, device: DeviceRef): Promise<{ username: string; secret: string }> {
  return db.transaction((tx) => replaceDeviceCredential(tx, device));
}

/** Inside the caller's transaction: the device's secret stops working (kept, marked revoked). Returns how many were active. */
export async function revokeDeviceCredentials(tx: Writer, device: { siteId: string; kind: DeviceKind; deviceId: string }, at: Date) {
  const [result] = await tx
    .update(deviceCredentials)
    .set({ revokedAt: at })
    .where(
      and(
        eq(deviceCredentials.siteId, device.siteId),
        eq(deviceCredentials.deviceKind, device.kind),
        eq(deviceCredentials.deviceId, device.deviceId),
        isNull(deviceCredentials.revokedAt),
      ),
    );
  return result.affectedRows;
}
