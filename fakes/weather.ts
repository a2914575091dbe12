// The weather outside a demo site: temperature, humidity and sun, as pure functions of
// time and a seed. Invented but plausible for a temperate winter; every number here
// that is not marked with a source is a choice, not a measurement.
import { DateTime } from "luxon";
import { smoothNoise } from "./random";

export type Climate = {
  latitudeDeg: number;
  /** A fixed daily mean; when absent the mean follows the season for the latitude. */
  meanC?: number;
  /** Half the clear-day range between the pre-dawn low and the afternoon high. */
  swingC: number;
  /** Local solar hour of the day's high. */
  warmestHour: number;
  /** Size of the slow (weather-system) and quick wanderings of the temperature. */
  driftC: number;
  jitterC: number;
};

export const DEFAULT_CLIMATE: Climate = {
  latitudeDeg: 51.5,
  swingC: 4,
  warmestHour: 14.5,
  driftC: 1.5,
  jitterC: 0.5,
};

export type Weather = {
  outsideC: number;
  outsideRh: number;
  /** Global irradiance on a horizontal surface, W/m². */
  solarWm2: number;
  /** Solar elevation in degrees (negative at night). */
  sunElevationDeg: number;
};

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const rad = (deg: number) => (deg * Math.PI) / 180;

/**
 * Saturation vapour pressure over water, hPa: Magnus form with the Alduchov & Eskridge
 * (1996) coefficients (REFERENCES.md).
 */
export function saturationVapourPressureHPa(tempC: number) {
  return 6.1094 * Math.exp((17.625 * tempC) / (243.04 + tempC));
}

/** Invented: a seasonal daily mean that is cooler and swings more further from the equator. */
export function seasonalMeanC(latitudeDeg: number, dayOfYear: number) {
  const lat = Math.abs(latitudeDeg);
  const annual = 28.5 - 0.35 * lat;
  const halfRange = 0.11 * lat;
  const coldestDay = latitudeDeg >= 0 ? 20 : 202;
  return annual - halfRange * Math.cos((2 * Math.PI * (dayOfYear - coldestDay)) / 365);
}

/** Solar declination in degrees (Cooper's approximation). */
export function declinationDeg(dayOfYear: number) {
  return 23.44 * Math.sin((2 * Math.PI * (284 + dayOfYear)) / 365);
}

/** Local solar hours of sunrise and sunset (polar day: 0 and 24; polar night: 12 and 12). */
export function daylight(latitudeDeg: number, dayOfYear: number) {
  const x = -Math.tan(rad(latitudeDeg)) * Math.tan(rad(declinationDeg(dayOfYear)));
  const h0 = (Math.acos(Math.min(1, Math.max(-1, x))) * 180) / Math.PI / 15;
  return { sunrise: 12 - h0, sunset: 12 + h0 };
}

export function sunElevationDeg(latitudeDeg: number, dayOfYear: number, solarHour: number) {
  const phi = rad(latitudeDeg);
  const delta = rad(declinationDeg(dayOfYear));
  const h = rad(15 * (solarHour - 12));
  const s = Math.sin(phi) * Math.sin(delta) + Math.cos(phi) * Math.cos(delta) * Math.cos(h);
  return (Math.asin(Math.min(1, Math.max(-1, s))) * 180) / Math.PI;
}

/**
 * Irradiance on the ground from the sun's elevation and cloud cover (0–1): the
 * Kasten & Czeplak (1980) clear-sky line and cloud factor, quoted from memory.
 */
export function irradianceWm2(elevationDeg: number, cloudCover: number) {
  if (elevationDeg <= 0) return 0;
  const clear = Math.max(0, 910 * Math.sin(rad(elevationDeg)) - 30);
  return clear * (1 - 0.75 * Math.pow(Math.min(1, Math.max(0, cloudCover)), 3.4));
}

/**
 * The day's temperature shape in [-1, 1]: -1 at the low (half an hour before sunrise),
 * +1 at the high, a half-cosine up and a longer half-cosine down.
 */
export function dailyShape(solarHour: number, coldestHour: number, warmestHour: number) {
  const rise = warmestHour - coldestHour;
  const h = (((solarHour - coldestHour) % 24) + 24) % 24;
  if (h <= rise) return -Math.cos((Math.PI * h) / rise);
  return Math.cos((Math.PI * (h - rise)) / (24 - rise));
}

/** Local solar time from the site's wall clock: the zone's standard meridian stands in for the longitude. */
export function localSolarTime(tMs: number, timeZone: string) {
  const local = DateTime.fromMillis(tMs, { zone: timeZone });
  const solarHour = local.hour + local.minute / 60 + local.second / 3600 - (local.isInDST ? 1 : 0);
  return { dayOfYear: local.ordinal, solarHour: (solarHour + 24) % 24 };
}

/** The weather at one instant. One luxon conversion per call: call it once per step for a whole site. */
export function weatherAt(climate: Climate, seed: number, tMs: number, timeZone: string): Weather {
  const { dayOfYear, solarHour } = localSolarTime(tMs, timeZone);
  const { sunrise } = daylight(climate.latitudeDeg, dayOfYear);
  const coldestHour = Math.min(Math.max(sunrise - 0.5, 3), climate.warmestHour - 4);

  const cloud = 0.6 + 0.4 * smoothNoise(seed ^ 0x51, tMs, 6 * HOUR);
  const mean = (climate.meanC ?? seasonalMeanC(climate.latitudeDeg, dayOfYear)) + climate.driftC * smoothNoise(seed ^ 0x7e, tMs, 2 * DAY);
  // Cloudy days and nights swing less than clear ones.
  const swing = climate.swingC * (1.25 - 0.5 * cloud);
  const outsideC = mean + swing * dailyShape(solarHour, coldestHour, climate.warmestHour) + climate.jitterC * smoothNoise(seed ^ 0x3c, tMs, 3 * HOUR);

  // The air holds about the moisture it had at the night's low: RH rises as it cools.
  const dewPointC = mean - swing - 0.5 + 0.8 * smoothNoise(seed ^ 0x2d, tMs, 12 * HOUR);
  const outsideRh = Math.min(100, (100 * saturationVapourPressureHPa(dewPointC)) / saturationVapourPressureHPa(outsideC));

  const elevation = sunElevationDeg(climate.latitudeDeg, dayOfYear, solarHour);
  return { outsideC, outsideRh, solarWm2: irradianceWm2(elevation, cloud), sunElevationDeg: elevation };
}
