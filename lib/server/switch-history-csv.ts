import "server-only";
import { openSwitchHistoryStream, type SwitchStreamRow } from "@/db/queries/switch-history";
import type { SwitchFilter } from "@/lib/schemas/switch-history";
import { switchStatus } from "@/lib/switch-history";
import { switchCsvHead, switchCsvLines } from "@/lib/switch-history-csv";

/** Rows written into one chunk of the byte stream (about 200 KB of CSV). */
const CHUNK_ROWS = 1000;

/**
 * The filtered switch history as a CSV byte stream, newest first, from one streamed
 * query. Rows are read only while the reader keeps up (the query's socket is paused
 * otherwise), so memory holds a few chunks however long the history is. The filter is
 * checked before this returns: bad filters throw here, while an error answer can still
 * be sent. The query's connection goes back when the rows end, on an error, and when the
 * reader cancels.
 */
export async function switchHistoryCsv(args: { siteId: string; timeZone: string; filter: SwitchFilter }): Promise<ReadableStream<Uint8Array>> {
  const source = await openSwitchHistoryStream(args);
  const { plugs } = source;
  const line = switchCsvLines(args.timeZone);
  const encoder = new TextEncoder();
  let text = "";
  let count = 0;
  return new ReadableStream<Uint8Array>({
    start(controller) {
      const flush = () => {
        if (count === 0) return;
        const chunk = text;
        text = "";
        count = 0;
        controller.enqueue(encoder.encode(chunk));
        if ((controller.desiredSize ?? 0) <= 0) source.pause();
      };
      controller.enqueue(encoder.encode(switchCsvHead(args.timeZone)));
      source.listen({
        row: (r: SwitchStreamRow) => {
          const plug = plugs.get(r[2])!;
          const cause = r[5];
          text += line({
            at: r[1],
            houseName: plug.houseName,
            plugName: plug.name,
            fromOn: r[3] === null ? null : Boolean(r[3]),
            toOn: Boolean(r[4]),
            cause,
            status: switchStatus({ cause, withdrawnAt: r[14], ackAt: r[12] }),
            readingTempC: r[6],
            readingAt: r[7],
            userName: r[9],
            reason: r[10],
            latencyMs: r[13],
            commandId: r[11],
          });
          if (++count === CHUNK_ROWS) flush();
        },
        end: () => {
          flush();
          controller.close();
        },
        error: (error) => controller.error(error),
      });
    },
    pull() {
      source.resume();
    },
    cancel() {
      source.close();
    },
  });
}
