import { createOverride, getOverridePanel, requirePlugOfSite } from "@/db/queries/overrides";
import { siteRoute } from "@/lib/server/site-route";
import { overrideSchema, plugParams } from "@/lib/schemas/override";

export const dynamic = "force-dynamic";

const loadPlug = ({ site, params }: { site: { id: string }; params: { plugId: string } }) =>
  requirePlugOfSite({ siteId: site.id, plugId: params.plugId });

/** The plug's state now, the override in force and its recent overrides, with who made and cancelled them. */
export const GET = siteRoute({
  params: plugParams,
  action: "site.view",
  load: loadPlug,
  handle: async ({ site, loaded: plug }) => Response.json(await getOverridePanel({ plug, timeZone: site.timeZone })),
});

/** Overrides the plug from now; the plug's earlier override in force ends. */
export const POST = siteRoute({
  params: plugParams,
  body: overrideSchema,
  action: "overrides.create",
  load: loadPlug,
  handle: async ({ site, loaded: plug, user, body }) =>
    Response.json({ override: await createOverride({ plug, timeZone: site.timeZone, userId: user.id, input: body }) }, { status: 201 }),
  wakes: ({ loaded: plug }) => ({ reason: "override", plug: plug.deviceId }),
});
