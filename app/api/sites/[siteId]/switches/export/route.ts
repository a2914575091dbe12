import { stringify } from "csv-stringify/sync";
import { DateTime } from "luxon";
import { streamSwitchHistory } from "@/db/queries/switch-history";
import { switchFilterSchema } from "@/lib/schemas/switch-history";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";
import { exportFileName } from "@/lib/switch-history";
import { switchCsvHeader, switchCsvRecord } from "@/lib/switch-history-csv";

/**
 * Every switch the filters cover as CSV, newest first, streamed: each batch is read
 * (keyset) only when the client has taken the one before.
 */
export const GET = siteRoute({
  params: siteParams,
  query: switchFilterSchema,
  action: "reports.export",
  handle: async ({ site, query: filter }) => {
    const timeZone = site.timeZone;
    const batches = streamSwitchHistory({ siteId: site.id, timeZone, filter });
    // The first batch is read before answering, so bad filters still get their 400.
    const first = await batches.next();
    const encoder = new TextEncoder();
    let pending: IteratorResult<unknown> | null = first;
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        // A UTF-8 byte-order mark so spreadsheets read °C and names with accents right.
        controller.enqueue(encoder.encode("\uFEFF" + stringify([switchCsvHeader(timeZone)])));
      },
      async pull(controller) {
        const next = pending ?? (await batches.next());
        pending = null;
        if (next.done) {
          controller.close();
          return;
        }
        const batch = next.value as Parameters<typeof switchCsvRecord>[0][];
        controller.enqueue(encoder.encode(stringify(batch.map((row) => switchCsvRecord(row, timeZone)))));
      },
      async cancel() {
        await batches.return(undefined);
      },
    });
    const today = DateTime.now().setZone(timeZone).toISODate()!;
    return new Response(body, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${exportFileName(site.slug, filter, today)}"`,
        "cache-control": "no-store",
      },
    });
  },
});
