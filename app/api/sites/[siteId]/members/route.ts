import { getMembersOfSite } from "@/db/queries/sites";
import { siteRoute } from "@/lib/server/site-route";
import { siteParams } from "@/lib/schemas/site";

export const GET = siteRoute({
  params: siteParams,
  action: "members.view",
  handle: async ({ site }) => Response.json({ members: await getMembersOfSite({ siteId: site.id }) }),
});
