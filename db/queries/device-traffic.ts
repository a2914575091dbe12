import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { deviceTraffic } from "@/db/schema";
import type { DeviceKind } from "@/lib/mqtt/topics";

export type DeviceTraffic = { slowed: number; oversized: number; disconnected: number; lastAt: Date | null };

/** What the broker's per-device limits did to the site's devices, by `kind/deviceId`; devices never limited are absent. */
export async function getDeviceTrafficBySite({ siteId }: { siteId: string }): Promise<Map<string, DeviceTraffic>> {
  const rows = await getDb()
    .select({
      kind: deviceTraffic.deviceKind,
      deviceId: deviceTraffic.deviceId,
      slowed: deviceTraffic.slowed,
      oversized: deviceTraffic.oversized,
      disconnected: deviceTraffic.disconnected,
      lastAt: deviceTraffic.lastAt,
    })
    .from(deviceTraffic)
    .where(eq(deviceTraffic.siteId, siteId));
  return new Map(rows.map(({ kind, deviceId, ...traffic }) => [trafficKey(kind, deviceId), traffic]));
}

export const trafficKey = (kind: DeviceKind, deviceId: string) => `${kind}/${deviceId}`;
