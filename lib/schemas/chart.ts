import { z } from "zod";
import { CHART_RANGE_KEYS, type ChartRange } from "@/lib/house-chart";

/** `?range=24h|7d` of a house's chart; 24 hours when it is left out. */
export const chartRange = z
  .enum(CHART_RANGE_KEYS as [ChartRange, ...ChartRange[]], { error: `must be ${CHART_RANGE_KEYS.join(" or ")}` })
  .default("24h");

export const chartQuery = z.object({ range: chartRange });
