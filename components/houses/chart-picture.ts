import type { HouseChart } from "@/db/queries/house-chart";
import type { TemperatureUnit } from "@/lib/domain";
import { coveredMs, summarise, type ChartRange } from "@/lib/house-chart";
import { toUnit, unitSymbol } from "@/lib/units";
import { formatRh, formatTemp } from "./live-format";

/** What the chart draws, already in the person's unit; times in ms. Kept apart from uPlot so the page can name it without loading uPlot. */
export type ChartPicture = {
  range: ChartRange;
  timeZone: string;
  unitSymbol: string;
  times: number[];
  temp: (number | null)[];
  rh: (number | null)[];
  bands: { from: number; until: number; low: number | null; high: number | null }[];
  heating: { from: number; until: number }[];
};

/** The chart's colours, from the palette (tailwind.config.ts), shared by the canvas and the legend. */
export const CHART_COLOURS = {
  temp: "#34562c", // leaf-700
  rh: "#596777", // frost-600
  band: "rgba(114, 165, 99, 0.18)", // leaf-400, light
  bandEdge: "rgba(64, 108, 53, 0.55)", // leaf-600
  heating: "rgba(207, 176, 138, 0.35)", // soil-300
} as const;

export const CHART_HEIGHT = 220;

function hoursAndMinutes(ms: number): string {
  const minutes = Math.round(ms / 60_000);
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

/** The chart in words: lowest, highest and latest temperature and humidity, and heating time. */
export function chartSummary(chart: HouseChart, unit: TemperatureUnit): string {
  const symbol = unitSymbol(unit);
  const t = (c: number) => `${formatTemp(toUnit(c, unit))} ${symbol}`;
  const low = summarise(chart.series.tempMinC).min;
  const high = summarise(chart.series.tempMaxC).max;
  const latest = summarise(chart.series.tempC).latest;
  const rh = summarise(chart.series.rh);
  const parts: string[] = [];
  if (low === null || high === null) parts.push("No readings in this time.");
  else parts.push(`Temperature ${t(low)} to ${t(high)}${latest !== null ? `, latest ${t(latest)}` : ""}.`);
  if (rh.min !== null && rh.max !== null) {
    parts.push(`Humidity ${formatRh(rh.min)} to ${formatRh(rh.max)}${rh.latest !== null ? `, latest ${formatRh(rh.latest)}` : ""}.`);
  }
  if (chart.heaters.length > 0) {
    const on = coveredMs(chart.heaters.flatMap((h) => h.periods));
    parts.push(on > 0 ? `Heating on for ${hoursAndMinutes(on)} in all.` : "Heating off throughout.");
  }
  return parts.join(" ");
}
