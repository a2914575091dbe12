import { countStoredMinutes } from "@/db/queries/reading-imports";
import { siteRoute } from "@/lib/server/site-route";
import { answer, readUpload, sensorOf } from "../handle";
import { importRouteSpec, readRows } from "../read";

/**
 * What importing the file (the body) would do, writing nothing: its first rows as read,
 * the counts of rows, good and bad, of new minutes and of minutes the sensor already
 * has, and each bad row's line and reason.
 */
export const POST = siteRoute({
  ...importRouteSpec,
  handle: async ({ request, query, loaded }) => {
    const upload = await readUpload(request);
    return answer(request, async (report) => {
      const { minutes, ...parsed } = await readRows(upload, query, report);
      const stored = await countStoredMinutes({ sensorId: loaded.id, minutes: minutes.minute, onProgress: (done, total) => report("checking", done, total) });
      return {
        sensor: sensorOf(loaded),
        fileName: query.fileName,
        header: upload.file.header,
        delimiter: upload.file.delimiter,
        ...parsed,
        minutes: minutes.minute.length,
        newMinutes: minutes.minute.length - stored,
        minutesAlreadyThere: stored,
      };
    });
  },
});
