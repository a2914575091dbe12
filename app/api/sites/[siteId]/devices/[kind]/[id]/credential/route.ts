import { issueDeviceCredential } from "@/db/device-credentials";
import { getDb } from "@/db/client";
import { getDeviceOfSite } from "@/db/queries/devices";
import { deviceParams } from "@/lib/schemas/device";
import { env } from "@/lib/server/env";
import { siteRoute } from "@/lib/server/site-route";

/** A new MQTT secret for a device, shown once; the device's earlier secret stops working. */
export const POST = siteRoute({
  params: deviceParams,
  action: "devices.manage",
  load: ({ site, params }) => getDeviceOfSite({ siteId: site.id, kind: params.kind, id: params.id }),
  handle: async ({ site, params, loaded: device }) => {
    const credential = await issueDeviceCredential(getDb(), {
      siteId: site.id,
      siteSlug: site.slug,
      kind: params.kind,
      deviceId: device.deviceId,
    });
    return Response.json(
      { ...credential, broker: env().CLOCHE_MQTT_URL, note: "Store this secret in the device now; Cloche keeps only a hash of it." },
      { status: 201, headers: { "cache-control": "no-store" } },
    );
  },
  wakes: ({ params, loaded: device }) => ({ reason: "device", ...(params.kind === "plug" ? { plug: device.deviceId } : {}) }),
});
