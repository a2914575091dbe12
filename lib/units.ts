// Temperatures are stored, computed and sent in °C everywhere; each person sees and
// types them in their own unit. Differentials (a band's width) scale without the offset.
import type { TemperatureUnit } from "./domain";

export const cToF = (c: number) => (c * 9) / 5 + 32;
export const fToC = (f: number) => ((f - 32) * 5) / 9;

/** A temperature in °C shown in `unit`. */
export function toUnit(c: number, unit: TemperatureUnit): number {
  return unit === "f" ? cToF(c) : c;
}

/** A temperature typed in `unit`, back to °C (rounded to 0.1 °C, the stored precision). */
export function fromUnit(value: number, unit: TemperatureUnit): number {
  return unit === "f" ? Math.round(fToC(value) * 10) / 10 : value;
}

/** A difference of temperatures (a differential) in °C shown in `unit`. */
export function differenceToUnit(deltaC: number, unit: TemperatureUnit): number {
  return unit === "f" ? (deltaC * 9) / 5 : deltaC;
}

export function unitSymbol(unit: TemperatureUnit): string {
  return unit === "f" ? "°F" : "°C";
}

/** "12.4 °C" / "54.3 °F"; "—" when there is no value. */
export function formatTemperature(c: number | null | undefined, unit: TemperatureUnit, digits = 1): string {
  if (c === null || c === undefined || !Number.isFinite(c)) return "—";
  return `${toUnit(c, unit).toFixed(digits)} ${unitSymbol(unit)}`;
}
