import { importReadingMinutes } from "@/db/queries/reading-imports";
import { AppError } from "@/lib/errors";
import { readingImportOptionsSchema } from "@/lib/schemas/reading-import";
import { siteRoute } from "@/lib/server/site-route";
import { answer, readUpload, Refusal, sensorOf } from "./handle";
import { importRouteSpec, readRows } from "./read";

/**
 * Imports the file (the body) into the sensor's per-minute history: all of it or,
 * when any row is bad, nothing (the answer lists the bad rows). Minutes the sensor
 * already has are left as they are, so importing a file again adds nothing.
 */
export const POST = siteRoute({
  ...importRouteSpec,
  handle: async ({ request, query, loaded, site, user }) => {
    const upload = await readUpload(request);
    return answer(
      request,
      async (report) => {
        const { minutes, problems, bad, rows, firstAt, lastAt, note } = await readRows(upload, query, report);
        if (bad > 0) {
          const message = `${bad.toLocaleString("en-GB")} of ${rows.toLocaleString("en-GB")} rows ${bad === 1 ? "needs" : "need"} fixing, so nothing was imported. Correct or remove ${bad === 1 ? "it" : "them"} in the file and import it again.`;
          throw new Refusal(new AppError("bad_input", message, { file: message }), { rows: problems, bad, rowsRead: rows });
        }
        const imported = await importReadingMinutes({
          siteId: site.id,
          sensorId: loaded.id,
          userId: user.id,
          fileName: query.fileName,
          fileSha256: upload.sha256,
          options: readingImportOptionsSchema.parse(query),
          rowsRead: rows,
          minutes,
          firstAt,
          lastAt,
          note,
          onProgress: (done, total) => report("writing", done, total),
        });
        return { sensor: sensorOf(loaded), import: imported };
      },
      201,
    );
  },
});
