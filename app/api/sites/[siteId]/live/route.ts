import { getSiteLive } from "@/db/queries/live";
import { siteRoute } from "@/lib/server/site-route";
import { siteParams } from "@/lib/schemas/site";

export const dynamic = "force-dynamic";

/** Latest readings, 24 h ranges, plug states and open alerts; the overview polls this. */
export const GET = siteRoute({
  params: siteParams,
  action: "site.view",
  handle: async ({ site }) => Response.json(await getSiteLive({ siteId: site.id })),
});
