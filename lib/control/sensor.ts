import { DEFAULT_STALE_AFTER_S } from "@/lib/domain";

/**
 * True when a reading taken at `atMs` is too old to act on at `nowMs`. A reading
 * exactly `staleAfterS` old still counts; one a moment older does not. Written so
 * that a NaN time or limit reads as stale. The controller's decision and the pages
 * both judge by this.
 */
export function isReadingStale(atMs: number, nowMs: number, staleAfterS: number): boolean {
  return !(nowMs - atMs <= staleAfterS * 1000);
}

/**
 * How old a sensor's reading may be before the pages call it stale: the strictest
 * limit of the plugs whose bands follow it, so that the page flags a reading as soon
 * as one of those plugs stops acting on it; the plugs' default for a sensor no plug
 * follows.
 */
export function sensorStaleAfterS(followerLimitsS: readonly number[]): number {
  return followerLimitsS.length > 0 ? Math.min(...followerLimitsS) : DEFAULT_STALE_AFTER_S;
}

/** The reading's temperature if it is fresh enough to act on, else null. */
export function freshTempC(
  reading: { tempC: number | null; atMs: number } | null,
  nowMs: number,
  staleAfterS: number,
): number | null {
  if (reading === null) return null;
  const t = reading.tempC;
  if (t === null || !Number.isFinite(t)) return null;
  if (isReadingStale(reading.atMs, nowMs, staleAfterS)) return null;
  return t;
}
