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
