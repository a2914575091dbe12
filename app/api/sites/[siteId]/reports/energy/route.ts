import { getEnergyReport } from "@/db/queries/energy";
import { reportQuery } from "@/lib/schemas/report";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

export const dynamic = "force-dynamic";

/** Runtime, kWh and cost of the site's plugs for `?from=&to=` (local dates) `&by=day|week|month`. */
export const GET = siteRoute({
  params: siteParams,
  query: reportQuery,
  action: "reports.view",
  handle: async ({ site, query }) =>
    Response.json(await getEnergyReport({ siteId: site.id, fromDay: query.from, toDay: query.to, bucket: query.by }), {
      headers: { "cache-control": "private, no-store" },
    }),
});
