import { getAuditPage } from "@/db/queries/audit-trail";
import { auditFilterSchema } from "@/lib/schemas/audit";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

/** The site's audit trail, newest first, filtered; `nextCursor` asks for the page after. */
export const GET = siteRoute({
  params: siteParams,
  query: auditFilterSchema,
  action: "audit.view",
  handle: async ({ site, query }) => Response.json(await getAuditPage({ siteId: site.id, timeZone: site.timeZone, filter: query })),
});
