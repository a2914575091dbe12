// Humidity sums for the pages, the alerts (condensation risk) and the reports: numbers
// in, numbers out, in °C, % relative humidity, kPa and g/m³.
//
// Saturation vapour pressure over water uses the Magnus form with the coefficients of
// Alduchov & Eskridge (1996), J. Appl. Meteor. 35, 601–609: es = 6.1094·exp(17.625·T /
// (243.04 + T)) hPa. Dew point is its exact inversion; absolute humidity is the ideal
// gas law for water vapour.
//
// Inputs outside the bounds below, or not finite (NaN, ±Infinity, null from a sensor
// that did not send one), give null rather than a number: a reading that cannot be
// trusted gives no derived value, and callers show "—". Nothing here throws.

/** The temperatures the sums accept, °C: a greenhouse's and its sensor's range with room to spare. */
export const PSYCHRO_TEMP_RANGE_C = { min: -40, max: 60 } as const;

const A_HPA = 6.1094;
const B = 17.625;
const C_DEG = 243.04;
/** Specific gas constant of water vapour, J/(kg·K): R / M_w = 8.314462 / 0.018015. */
const R_VAPOUR = 461.5;
const KELVIN = 273.15;

const validTemp = (tempC: number | null | undefined): tempC is number =>
  typeof tempC === "number" && Number.isFinite(tempC) && tempC >= PSYCHRO_TEMP_RANGE_C.min && tempC <= PSYCHRO_TEMP_RANGE_C.max;

const validRh = (rh: number | null | undefined): rh is number => typeof rh === "number" && Number.isFinite(rh) && rh >= 0 && rh <= 100;

/** Saturation vapour pressure over water, kPa; null outside −40…60 °C or for a missing value. */
export function saturationVapourPressureKPa(tempC: number | null | undefined): number | null {
  if (!validTemp(tempC)) return null;
  return (A_HPA * Math.exp((B * tempC) / (C_DEG + tempC))) / 10;
}

/** Actual vapour pressure, kPa: es·RH/100. */
export function vapourPressureKPa(tempC: number | null | undefined, rh: number | null | undefined): number | null {
  const es = saturationVapourPressureKPa(tempC);
  if (es === null || !validRh(rh)) return null;
  return (es * rh) / 100;
}

/**
 * Dew point, °C: the temperature at which this air would be saturated (the Magnus
 * inversion). Null at 0 % RH (no dew point) and for values outside the bounds.
 */
export function dewPointC(tempC: number | null | undefined, rh: number | null | undefined): number | null {
  if (!validTemp(tempC) || !validRh(rh) || rh === 0) return null;
  const gamma = Math.log(rh / 100) + (B * tempC) / (C_DEG + tempC);
  return (C_DEG * gamma) / (B - gamma);
}

/** Vapour pressure deficit, kPa: es·(1 − RH/100). */
export function vapourPressureDeficitKPa(tempC: number | null | undefined, rh: number | null | undefined): number | null {
  const es = saturationVapourPressureKPa(tempC);
  if (es === null || !validRh(rh)) return null;
  return es * (1 - rh / 100);
}

/** Absolute humidity, g of water vapour per m³ of air: e / (R_v·T). */
export function absoluteHumidityGM3(tempC: number | null | undefined, rh: number | null | undefined): number | null {
  const e = vapourPressureKPa(tempC, rh);
  if (e === null) return null;
  return ((e * 1000) / (R_VAPOUR * (tempC! + KELVIN))) * 1000;
}
