// The choices a person makes to import a thermometer app's CSV: which columns hold
// the time, temperature and humidity, how the times are written and in which zone,
// the temperature unit and the decimal separator. The form and the import handlers
// share this schema; the handlers take it from the URL's query (so the file itself
// can be the request body), hence every value is text.
import { z } from "zod";
import { DATE_FORMATS } from "@/lib/readings-import/formats";

export const READING_IMPORT_LIMITS = {
  /** Bytes of the file. */
  maxBytes: 20 * 1024 * 1024,
  /** Data lines (the header not counted). */
  maxRows: 200_000,
  /** Problems listed one by one; the rest are counted. */
  problemsShown: 100,
  /** Rows of the file shown as read in the preview. */
  previewRows: 20,
} as const;

const columnName = (label: string) =>
  z
    .string()
    .trim()
    .min(1, `Choose the ${label} column`)
    .max(200, `The ${label} column's name is too long`);

const isZone = (zone: string) => {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: zone });
    return true;
  } catch {
    return false;
  }
};

export const readingImportOptionsSchema = z.object({
  timeColumn: columnName("time"),
  temperatureColumn: columnName("temperature"),
  /** Empty: the file's humidity is not imported (or it has none). */
  humidityColumn: z.string().trim().max(200, "The humidity column's name is too long"),
  dateFormat: z.enum(DATE_FORMATS, { error: "Choose how the file writes its times" }),
  /** The zone of times written without an offset; a time with its own offset (or Z) keeps it. */
  timeZone: z.string().min(1, "Choose a time zone").refine(isZone, "Not a time zone Cloche knows (e.g. Europe/London)"),
  unit: z.enum(["c", "f"], { error: "Choose °C or °F" }),
  decimal: z.enum([".", ","], { error: "Choose the decimal separator" }),
});

export type ReadingImportOptions = z.infer<typeof readingImportOptionsSchema>;

/** The import handlers' query: the options and the file's name. */
export const readingImportQuerySchema = readingImportOptionsSchema.extend({
  fileName: z.string().trim().min(1, "Name the file").max(255, "The file's name is too long"),
});

export type ReadingImportQuery = z.infer<typeof readingImportQuerySchema>;
