// Device credentials: issued to a device (the secret is shown once), stored hashed.
import { and, eq, isNull } from "drizzle-orm";
import type { Database } from "@/db/client";
import { deviceCredentials } from "@/db/schema";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { hashDeviceSecret, newDeviceSecret } from "@/lib/server/device-secrets";
import type { DeviceKind } from "@/lib/mqtt/topics";

export async function lookupDeviceSecret(db: Database, username: string): Promise<string | null> {
  const [row] = await db
    .select({ secretHash: deviceCredentials.secretHash })
    .from(deviceCredentials)
    .where(and(eq(deviceCredentials.username, username), isNull(deviceCredentials.revokedAt)))
    .limit(1);
  return row?.secretHash ?? null;
}

/** A new secret for a device; any earlier one stops working. Returns the secret, once. */
export async function issueDeviceCredential(
  db: Database,
  device: { siteId: string; siteSlug: string; kind: DeviceKind; deviceId: string },
): Promise<{ username: string; secret: string }> {
  const username = deviceUsername(device.siteSlug, device.kind, device.deviceId);
  const secret = newDeviceSecret();
  await db.transaction(async (tx) => {
    await tx.delete(deviceCredentials).where(eq(deviceCredentials.username, username));
    await tx.insert(deviceCredentials).values({
      siteId: device.siteId,
      deviceKind: device.kind,
      deviceId: device.deviceId,
      username,
      secretHash: hashDeviceSecret(secret),
    });
  });
  return { username, secret };
}
