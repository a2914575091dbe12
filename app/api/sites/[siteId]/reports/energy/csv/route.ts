import { stringify } from "csv-stringify/sync";
import { getEnergyReport } from "@/db/queries/energy";
import { reportCsvRows } from "@/lib/energy/report-csv";
import { reportQuery } from "@/lib/schemas/report";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

export const dynamic = "force-dynamic";

/** The energy report as CSV: a row per plug and period, the standing charges, the total. */
export const GET = siteRoute({
  params: siteParams,
  query: reportQuery,
  action: "reports.export",
  handle: async ({ site, query }) => {
    const report = await getEnergyReport({ siteId: site.id, fromDay: query.from, toDay: query.to, bucket: query.by });
    return new Response(stringify(reportCsvRows(report, { currency: report.currency })), {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${site.slug}-energy-${query.from}-to-${query.to}.csv"`,
        "cache-control": "private, no-store",
      },
    });
  },
});
