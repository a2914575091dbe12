// Heating degree-days: how cold each local day was, as a figure that heating energy
// should follow. Two published definitions from the outside air, and the house's own
// inside–outside figure.
//
// - UK (Met Office, base 15.5 °C): the max–min method, four cases on the day's highest
//   and lowest against the base, as tabulated in CIBSE TM41 "Degree-days: theory and
//   application" (2006) as the "Met Office equations" (quoted from memory).
// - US (base 65 °F): 65 °F minus the day's mean, where the mean is (highest + lowest) / 2,
//   the definition of the US National Weather Service and NOAA's Climate Prediction
//   Center (ASHRAE Handbook—Fundamentals, chapter "Climatic design information", uses
//   the same base). We use (max + min) / 2, not the mean of readings, so the figures
//   match the published US series.
// - Inside–outside: the day's mean inside less its mean outside, where positive. A
//   house's heat loss is Q = U·A·ΔT (lib/thermal/heat-loss.ts), so heating kWh per such
//   kelvin-day approximates its U·A in kWh per K per day (sun and the soil make it less).
import { DateTime } from "luxon";
import type { DegreeDayMethod } from "../domain";
import { cToF } from "../units";
import { dayStartMs, daysFromTo, nextDay } from "./calendar";

export const UK_BASE_C = 15.5;
export const US_BASE_F = 65;

/** A day counts only when at least this share of its minutes has a reading. */
export const MIN_DAY_COVERAGE = 0.75;

export const DEGREE_DAY_UNITS: Record<DegreeDayMethod, string> = {
  uk_met_office: "°C·day",
  us_mean: "°F·day",
};

/** UK Met Office degree-days of one day (°C·day), from its highest and lowest (CIBSE TM41's Met Office equations). */
export function ukMetOfficeDegreeDays(maxC: number, minC: number, baseC = UK_BASE_C): number {
  assertPair(maxC, minC);
  if (minC >= baseC) return 0;
  if (maxC <= baseC) return baseC - (maxC + minC) / 2;
  if (maxC - baseC < baseC - minC) return (baseC - minC) / 2 - (maxC - baseC) / 4;
  return (baseC - minC) / 4;
}

/** US heating degree-days of one day (°F·day): base minus (highest + lowest) / 2, never below 0. */
export function usMeanDegreeDays(maxF: number, minF: number, baseF = US_BASE_F): number {
  assertPair(maxF, minF);
  return Math.max(0, baseF - (maxF + minF) / 2);
}

function assertPair(max: number, min: number) {
  if (!Number.isFinite(max) || !Number.isFinite(min)) throw new RangeError("the day's highest and lowest must be numbers");
  if (min > max) throw new RangeError(`the day's lowest (${min}) is above its highest (${max})`);
}

/** Degree-days of one day in the site's method, in that method's own unit (°C·day or °F·day). */
export function degreeDays(method: DegreeDayMethod, day: { maxC: number; minC: number }): number {
  return method === "uk_met_office" ? ukMetOfficeDegreeDays(day.maxC, day.minC) : usMeanDegreeDays(cToF(day.maxC), cToF(day.minC));
}

/** The house's own figure (K·day): mean inside less mean outside, 0 when outside was as warm or warmer. */
export function insideOutsideDegreeDays(insideMeanC: number, outsideMeanC: number): number {
  if (!Number.isFinite(insideMeanC) || !Number.isFinite(outsideMeanC)) throw new RangeError("both means must be numbers");
  return Math.max(0, insideMeanC - outsideMeanC);
}

/** One local day as real instants: 23, 24 or 25 hours long across a clock change. */
export type DayWindow = { day: string; startMs: number; endMs: number; minutes: number };

export function dayWindows(fromDay: string, toDay: string, zone: string): DayWindow[] {
  if (!DateTime.fromISO(fromDay).isValid || !DateTime.fromISO(toDay).isValid) throw new RangeError(`"${fromDay}"–"${toDay}" is not a range of dates`);
  if (fromDay > toDay) throw new RangeError(`the range starts (${fromDay}) after it ends (${toDay})`);
  return daysFromTo(fromDay, toDay).map((day) => {
    const startMs = dayStartMs(day, zone);
    const endMs = dayStartMs(nextDay(day), zone);
    return { day, startMs, endMs, minutes: Math.round((endMs - startMs) / 60_000) };
  });
}

/** What the per-minute roll-up gives for one sensor (or group of sensors) over one local day. */
export type DayAggregate = { minutesWithData: number; minC: number | null; maxC: number | null; meanC: number | null };

export type DayTemperatures = { minC: number; maxC: number; meanC: number; coverage: number };

/**
 * The day's lowest, highest and mean, or null when less than MIN_DAY_COVERAGE of its
 * minutes have readings: such a day is missing, never 0. The mean is the mean of the
 * per-minute means (each minute weighs the same, however many readings it had).
 */
export function dayTemperatures(aggregate: DayAggregate | undefined, window: Pick<DayWindow, "minutes">): DayTemperatures | null {
  if (!aggregate || aggregate.minC === null || aggregate.maxC === null || aggregate.meanC === null) return null;
  const coverage = Math.min(1, aggregate.minutesWithData / window.minutes);
  if (coverage < MIN_DAY_COVERAGE) return null;
  return { minC: aggregate.minC, maxC: aggregate.maxC, meanC: aggregate.meanC, coverage };
}

/**
 * kWh per kelvin-day that the heat-loss sums expect of a house: its W/K (U·A of the
 * glazing plus the air exchange) over 24 hours, in kWh.
 */
export function expectedKwhPerKelvinDay(totalWK: number): number {
  return (totalWK * 24) / 1000;
}
