import "server-only";
import { stringify } from "csv-stringify/sync";
import { streamSwitchHistory, type SwitchHistoryRow } from "@/db/queries/switch-history";
import type { SwitchFilter } from "@/lib/schemas/switch-history";
import { switchCsvHeader, switchCsvRecords } from "@/lib/switch-history-csv";

/**
 * The filtered switch history as a CSV byte stream, newest first. Each keyset batch is
 * read only when the reader has taken the one before, so memory holds one batch however
 * long the history is. The first batch is read before this returns: bad filters throw
 * here, while an error answer can still be sent.
 */
export async function switchHistoryCsv(args: { siteId: string; timeZone: string; filter: SwitchFilter; batchSize?: number }): Promise<ReadableStream<Uint8Array>> {
  const { timeZone } = args;
  const batches = streamSwitchHistory(args);
  const encoder = new TextEncoder();
  const record = switchCsvRecords(timeZone);
  let pending: IteratorResult<SwitchHistoryRow[]> | null = await batches.next();
  return new ReadableStream<Uint8Array>({
    start(controller) {
      // A UTF-8 byte-order mark, so spreadsheets read °C and accented names right.
      controller.enqueue(encoder.encode("\uFEFF" + stringify([switchCsvHeader(timeZone)])));
    },
    async pull(controller) {
      const next = pending ?? (await batches.next());
      pending = null;
      if (next.done) {
        controller.close();
        return;
      }
      controller.enqueue(encoder.encode(stringify(next.value.map(record))));
    },
    async cancel() {
      await batches.return(undefined);
    },
  });
}
