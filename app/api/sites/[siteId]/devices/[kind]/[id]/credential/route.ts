import { issueCredential, revokeCredential } from "@/db/queries/credentials";
import { getDeviceOfSite } from "@/db/queries/devices";
import type { WakePayload } from "@/lib/mqtt/topics";
import { deviceParams } from "@/lib/schemas/device";
import { env } from "@/lib/server/env";
import { siteRoute } from "@/lib/server/site-route";

const loadDevice = ({ site, params }: { site: { id: string }; params: { kind: "plug" | "sensor"; id: string } }) =>
  getDeviceOfSite({ siteId: site.id, kind: params.kind, id: params.id });

const wakeFor = ({ params, loaded: device }: { params: { kind: "plug" | "sensor" }; loaded: { deviceId: string } }): WakePayload => ({
  reason: "device",
  ...(params.kind === "plug" ? { plug: device.deviceId } : {}),
});

/** A new MQTT secret for a device, shown once; the device's earlier secret stops working. */
export const POST = siteRoute({
  params: deviceParams,
  action: "devices.manage",
  load: loadDevice,
  handle: async ({ site, params, user, loaded: device }) => {
    const credential = await issueCredential({ site, kind: params.kind, device, userId: user.id });
    return Response.json(
      { ...credential, broker: env().CLOCHE_MQTT_URL, note: "Store this secret in the device now; Cloche keeps only a hash of it." },
      { status: 201, headers: { "cache-control": "no-store" } },
    );
  },
  wakes: wakeFor,
});

/** Revokes the device's secret: it can no longer sign in to the broker. */
export const DELETE = siteRoute({
  params: deviceParams,
  action: "devices.manage",
  load: loadDevice,
  handle: async ({ site, params, user, loaded: device }) =>
    Response.json(await revokeCredential({ site, kind: params.kind, device, userId: user.id })),
  wakes: wakeFor,
});
