import { requirePlug, retirePlug, updatePlug } from "@/db/queries/plugs";
import { plugChangeSchema, plugParams } from "@/lib/schemas/plug";
import { siteRoute } from "@/lib/server/site-route";

const loadPlug = ({ site, params }: { site: { id: string }; params: { plugId: string } }) =>
  requirePlug({ siteId: site.id, plugId: params.plugId });

export const GET = siteRoute({
  params: plugParams,
  action: "site.view",
  load: loadPlug,
  handle: async ({ loaded: plug }) => Response.json({ plug }),
});

export const PATCH = siteRoute({
  params: plugParams,
  body: plugChangeSchema,
  action: "devices.manage",
  load: loadPlug,
  handle: async ({ site, user, loaded: plug, body }) => Response.json({ plug: await updatePlug({ site, plug, userId: user.id, change: body }) }),
  wakes: ({ loaded: plug }) => ({ reason: "device", plug: plug.deviceId }),
});

/** Retires the plug: it is no longer switched, its credentials are revoked, its history stays. */
export const DELETE = siteRoute({
  params: plugParams,
  action: "devices.manage",
  load: loadPlug,
  handle: async ({ site, user, loaded: plug }) => Response.json({ plug: await retirePlug({ site, plug, userId: user.id }) }),
  wakes: ({ loaded: plug }) => ({ reason: "device", plug: plug.deviceId }),
});
