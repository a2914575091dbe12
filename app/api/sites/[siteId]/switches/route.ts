import { getSwitchHistoryPage } from "@/db/queries/switch-history";
import { switchPageSchema } from "@/lib/schemas/switch-history";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

/** The site's switches, newest first, filtered; `nextCursor` asks for the page after. */
export const GET = siteRoute({
  params: siteParams,
  query: switchPageSchema,
  action: "history.view",
  handle: async ({ site, query: { cursor, limit, ...filter } }) =>
    Response.json(await getSwitchHistoryPage({ siteId: site.id, timeZone: site.timeZone, filter, cursor, limit })),
});
