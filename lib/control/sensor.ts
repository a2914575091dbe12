/**
 * The reading's temperature if it is fresh enough to act on, else null. A reading
 * exactly `staleAfterS` old still counts; one a moment older does not.
 */
export function freshTempC(
  reading: { tempC: number | null; atMs: number } | null,
  nowMs: number,
  staleAfterS: number,
): number | null {
  if (reading === null) return null;
  const t = reading.tempC;
  if (t === null || !Number.isFinite(t)) return null;
  // Written so that a NaN time or limit reads as stale.
  if (!(nowMs - reading.atMs <= staleAfterS * 1000)) return null;
  return t;
}
