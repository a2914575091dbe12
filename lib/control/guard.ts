/**
 * Anti-short-cycle guard: the instant a change away from the current state becomes
 * allowed, or null when it is allowed now. The plug must have been on for `minOnS`
 * (or off for `minOffS`) first; the change goes through exactly at that boundary.
 */
export function guardUntil(
  current: { on: boolean; sinceMs: number },
  nowMs: number,
  minOnS: number,
  minOffS: number,
): number | null {
  const releaseMs = current.sinceMs + (current.on ? minOnS : minOffS) * 1000;
  return nowMs < releaseMs ? releaseMs : null;
}
