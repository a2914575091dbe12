import type { ChartRange } from "@/lib/house-chart";

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
