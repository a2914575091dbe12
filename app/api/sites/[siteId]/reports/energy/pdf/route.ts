import { getEnergyReport } from "@/db/queries/energy";
import { reportQuery } from "@/lib/schemas/report";
import { siteParams } from "@/lib/schemas/site";
import { renderReportPdf } from "@/lib/server/report-pdf";
import { siteRoute } from "@/lib/server/site-route";

export const dynamic = "force-dynamic";
// pdfkit needs Node's streams and file system.
export const runtime = "nodejs";

/** The printable report of `?from=&to=`: site, period, tariffs, totals, a chart and a table per house. */
export const GET = siteRoute({
  params: siteParams,
  query: reportQuery,
  action: "reports.export",
  handle: async ({ site, query }) => {
    const report = await getEnergyReport({ siteId: site.id, fromDay: query.from, toDay: query.to, bucket: query.by });
    const pdf = await renderReportPdf(report, { title: "Energy report", madeAt: new Date() });
    return new Response(new Uint8Array(pdf), {
      headers: {
        "content-type": "application/pdf",
        "content-disposition": `attachment; filename="${site.slug}-energy-${query.from}-to-${query.to}.pdf"`,
        "cache-control": "private, no-store",
      },
    });
  },
});
