import { z } from "zod";
import { issueDeviceCredential } from "@/db/device-credentials";
import { getDb } from "@/db/client";
import { getDeviceOfSite } from "@/db/queries/devices";
import { env } from "@/lib/server/env";
import { parseWith, route } from "@/lib/server/http";
import { recordId } from "@/lib/schemas/common";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

const params = z.object({
  siteId: recordId("site"),
  kind: z.enum(["plug", "sensor"], { error: "kind must be plug or sensor" }),
  id: recordId("device"),
});

type Params = { siteId: string; kind: string; id: string };

/** A new MQTT secret for a device, shown once; the device's earlier secret stops working. */
export const POST = route<Params>(async (request, raw) => {
  const { siteId, kind, id } = parseWith(params, raw);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  const device = await getDeviceOfSite({ siteId, kind, id });
  requirePermission(site, "devices.manage");
  const credential = await issueDeviceCredential(getDb(), { siteId, siteSlug: site.slug, kind, deviceId: device.deviceId });
  return Response.json(
    { ...credential, broker: env().CLOCHE_MQTT_URL, note: "Store this secret in the device now; Cloche keeps only a hash of it." },
    { status: 201, headers: { "cache-control": "no-store" } },
  );
});
