import { z } from "zod";
import { CHART_RANGE_KEYS, type ChartRange } from "@/lib/house-chart";
import { houseParams } from "./house";

/** `?range=24h|7d` of a house's chart; 24 hours when it is left out. */
export const chartRange = z
  .enum(CHART_RANGE_KEYS as [ChartRange, ...ChartRange[]], { error: `must be ${CHART_RANGE_KEYS.join(" or ")}` })
  .default("24h");

/** A house's chart: the route's segments and its `range` query, parsed together and first. */
export const chartParams = houseParams.extend({ range: chartRange });
