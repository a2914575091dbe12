import { updateSite } from "@/db/queries/sites";
import { siteRoute } from "@/lib/server/site-route";
import { changeAffectsControl, siteChangeSchema, siteParams } from "@/lib/schemas/site";

export const GET = siteRoute({
  params: siteParams,
  action: "site.view",
  handle: async ({ site }) => Response.json({ site }),
});

export const PATCH = siteRoute({
  params: siteParams,
  body: siteChangeSchema,
  action: "site.edit",
  handle: async ({ site, user, body }) => Response.json({ site: await updateSite({ site, userId: user.id, change: body }) }),
  wakes: ({ body }) => (changeAffectsControl(body) ? { reason: "site" } : null),
});
