import { z } from "zod";
import { timeOfDay } from "./common";

/**
 * PUT /api/sites/[siteId]/alerts/summary-time: when the daily summary goes out, HH:MM in
 * the site's zone, or null for none. Before noon it covers yesterday; from noon, the
 * day so far.
 */
export const summaryTimeSchema = z.object({
  summaryTime: timeOfDay("Summary time").nullable(),
});
export type SummaryTime = z.infer<typeof summaryTimeSchema>;

/** What a summary sent at this time covers, in words. */
export function summaryCovers(time: string): string {
  return time < "12:00" ? "yesterday, the whole day" : "today so far";
}
