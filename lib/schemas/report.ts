import { z } from "zod";
import { DateTime } from "luxon";
import { REPORT_BUCKETS, type ReportBucket } from "@/lib/energy/report";
import { localDate } from "./common";

/** The longest report: a year and a bit, so a yearly report or a long bill period fits. */
export const REPORT_MAX_DAYS = 400;

export const REPORT_BUCKET_LABELS: Record<ReportBucket, string> = { day: "By day", week: "By week", month: "By month" };

/** Local dates from `from` to `to`, both counted. */
export const daysInRange = (from: string, to: string) =>
  Math.round(DateTime.fromISO(to, { zone: "UTC" }).diff(DateTime.fromISO(from, { zone: "UTC" }), "days").days) + 1;

/** `?from=&to=&by=` of the energy report, its page, its CSV and its PDF. */
export const reportQuery = z
  .object({
    from: localDate("From"),
    to: localDate("To"),
    by: z.enum(REPORT_BUCKETS, { error: `By must be ${REPORT_BUCKETS.join(", ")}` }).default("day"),
  })
  .refine((q) => q.from <= q.to, { message: "From must not be after To", path: ["to"] })
  .refine((q) => q.from > q.to || daysInRange(q.from, q.to) <= REPORT_MAX_DAYS, {
    message: `A report covers at most ${REPORT_MAX_DAYS} days; choose a shorter range`,
    path: ["to"],
  });

export type ReportQuery = z.infer<typeof reportQuery>;
