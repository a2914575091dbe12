import type { DegreeDayHouse } from "@/db/queries/degree-days";

/** What a house's degree-day charts draw, kept apart from uPlot so the page can build it without loading uPlot. */
export type DegreeDayPicture = {
  unit: string;
  /** One point per day with both heating kWh and degree-days; `after` marks days since the step, if any. */
  points: { degreeDays: number; kwh: number; after: boolean }[];
  /** Weekly kWh per degree-day, by the week's Monday (UTC midnight, ms). */
  weeks: { atMs: number; kwhPerDegreeDay: number }[];
  /** The levels before and after the step, to draw as a line under the weeks. */
  step: { sinceMs: number; before: number; after: number } | null;
};

export const DEGREE_DAY_COLOURS = {
  before: "#596777", // frost-600
  after: "#34562c", // leaf-700
  level: "rgba(64, 108, 53, 0.55)", // leaf-600
} as const;

export const DEGREE_DAY_CHART_HEIGHT = 220;

const utcMs = (day: string) => Date.parse(`${day}T00:00:00Z`);

export function degreeDayPicture(house: DegreeDayHouse, unit: string): DegreeDayPicture {
  const since = house.trend.kind === "step" ? house.trend.sinceKey : null;
  return {
    unit,
    points: house.days
      .filter((d) => d.heatingKwh !== null && d.degreeDays !== null)
      .map((d) => ({ degreeDays: d.degreeDays!, kwh: d.heatingKwh!, after: since !== null && d.day >= since })),
    weeks: house.weeks.filter((w) => w.kwhPerDegreeDay !== null).map((w) => ({ atMs: utcMs(w.key), kwhPerDegreeDay: w.kwhPerDegreeDay! })),
    step: house.trend.kind === "step" ? { sinceMs: utcMs(house.trend.sinceKey), before: house.trend.before, after: house.trend.after } : null,
  };
}
