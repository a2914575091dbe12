import { cancelOverride, requirePlugOfSite } from "@/db/queries/overrides";
import { siteRoute } from "@/lib/server/site-route";
import { overrideParams } from "@/lib/schemas/override";

/** Cancels one of the plug's overrides in force: the plug goes back to its schedule. */
export const DELETE = siteRoute({
  params: overrideParams,
  action: "overrides.cancel",
  // The plug is loaded before the permission check; the override itself after it, so
  // that a viewer is refused the same way whether the override exists or not.
  load: ({ site, params }) => requirePlugOfSite({ siteId: site.id, plugId: params.plugId }),
  handle: async ({ site, loaded: plug, user, params }) =>
    Response.json({ override: await cancelOverride({ plug, timeZone: site.timeZone, overrideId: params.overrideId, userId: user.id }) }),
  wakes: ({ loaded: plug }) => ({ reason: "override", plug: plug.deviceId }),
});
