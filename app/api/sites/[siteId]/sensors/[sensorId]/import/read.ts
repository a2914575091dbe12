import "server-only";
import type { z } from "zod";
import { AppError } from "@/lib/errors";
import { parseReadings, repeatedHourNote, type ParsedReadings } from "@/lib/readings-import/parse";
import { sensorParams } from "@/lib/schemas/sensor";
import { readingImportOptionsSchema, readingImportQuerySchema, type ReadingImportQuery } from "@/lib/schemas/reading-import";
import { getImportSensor } from "@/db/queries/reading-imports";
import { Refusal, type Report, type UploadedFile } from "./handle";

/** What both steps declare to siteRoute(): the sensor in the path, the options in the query. */
export const importRouteSpec = {
  params: sensorParams,
  query: readingImportQuerySchema,
  action: "readings.import",
  load: ({ site, params }: { site: { id: string }; params: z.infer<typeof sensorParams> }) => getImportSensor({ siteId: site.id, sensorId: params.sensorId }),
} as const;

/** The file's rows read with the options; a mapping that does not fit the file is a 400 naming the field. */
export async function readRows(upload: UploadedFile, query: ReadingImportQuery, report: Report): Promise<ParsedReadings & { note: string | null }> {
  const options = readingImportOptionsSchema.parse(query);
  const parsed = await parseReadings(upload.file, options, { now: Date.now(), onProgress: (done, total) => report("reading", done, total) });
  if (!parsed.ok) throw new Refusal(new AppError("bad_input", parsed.message, parsed.field ? { [parsed.field]: parsed.message } : undefined));
  return { ...parsed, note: repeatedHourNote(parsed, options.timeZone) };
}
