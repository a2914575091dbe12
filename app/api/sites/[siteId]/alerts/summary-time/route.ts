import { saveSummaryTime } from "@/db/queries/summary-time";
import { summaryTimeSchema } from "@/lib/schemas/alert-summary";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

/** The owner sets when the daily summary goes out (HH:MM in the site's zone), or turns it off (null). */
export const PUT = siteRoute({
  params: siteParams,
  body: summaryTimeSchema,
  action: "site.edit",
  handle: async ({ site, user, body }) =>
    Response.json(await saveSummaryTime({ siteId: site.id, siteName: site.name, userId: user.id, summaryTime: body.summaryTime })),
});
