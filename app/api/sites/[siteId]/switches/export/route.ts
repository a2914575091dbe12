import { DateTime } from "luxon";
import { switchFilterSchema } from "@/lib/schemas/switch-history";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";
import { switchHistoryCsv } from "@/lib/server/switch-history-csv";
import { exportFileName } from "@/lib/switch-history";

/** Every switch the filters cover, as a CSV download streamed batch by batch. */
export const GET = siteRoute({
  params: siteParams,
  query: switchFilterSchema,
  action: "reports.export",
  handle: async ({ site, query: filter }) => {
    const body = await switchHistoryCsv({ siteId: site.id, timeZone: site.timeZone, filter });
    const today = DateTime.now().setZone(site.timeZone).toISODate()!;
    return new Response(body, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${exportFileName(site.slug, filter, today)}"`,
        "cache-control": "no-store",
      },
    });
  },
});
