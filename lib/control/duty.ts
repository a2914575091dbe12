/**
 * Whether a fail-safe duty cycle is in its on part at `nowMs`: on for the first
 * `percent` % of every period, periods counted from the Unix epoch. Aligning to the
 * epoch means every evaluation, on any controller, agrees without remembering anything.
 */
export function dutyCycleOn(nowMs: number, percent: number | null, periodS: number): boolean {
  if (percent === null || !(percent > 0)) return false;
  if (percent >= 100) return true;
  const periodMs = periodS * 1000;
  if (!(periodMs > 0)) return false;
  const phaseMs = ((nowMs % periodMs) + periodMs) % periodMs;
  return phaseMs < (periodMs * percent) / 100;
}
