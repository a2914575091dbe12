import { getAlertPage } from "@/db/queries/alerts";
import { alertListQuerySchema } from "@/lib/schemas/alert-list";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

/** The site's open or past alerts, newest first, with their e-mails; `nextCursor` asks for the page after. */
export const GET = siteRoute({
  params: siteParams,
  query: alertListQuerySchema,
  action: "alerts.view",
  handle: async ({ site, query }) => Response.json(await getAlertPage({ siteId: site.id, ...query })),
});
