// One alert condition over time: when it opens and when it closes.
//
// Two guards keep a reading that hovers at a limit from opening and closing an alert
// over and over:
// - a minimum duration: the condition must be active at every evaluation for `holdMs`
//   (from the first active one) before the alert opens; one evaluation that is not
//   active starts the wait again;
// - a hysteresis: once open, the alert closes only on an evaluation that is
//   "clearable", i.e. back past the limit by the hysteresis. A value between the limit
//   and limit ± hysteresis keeps it open (and does not start a new wait).
// Callers give both flags; `limits` below works them out for the usual shapes.
// An evaluation with no value (a reading without humidity, say) is simply not made.

export type ConditionState = {
  /** When the condition was first seen active without a break, while not yet open. */
  readonly pendingSinceMs: number | null;
  readonly open: boolean;
  /** When the open alert's condition began (the first active evaluation). */
  readonly openSinceMs: number | null;
};

export type ConditionChange = "raise" | "clear" | null;

export type ConditionStep = { readonly state: ConditionState; readonly change: ConditionChange };

export const CLOSED: ConditionState = Object.freeze({ pendingSinceMs: null, open: false, openSinceMs: null });

/** An open condition whose start is not known (an alert found open at start-up). */
export function openedAt(sinceMs: number | null): ConditionState {
  return { pendingSinceMs: null, open: true, openSinceMs: sinceMs };
}

const unchanged = (state: ConditionState): ConditionStep => ({ state, change: null });

/**
 * One evaluation. `active`: the condition holds now; `clearable`: it is back past the
 * limit by the hysteresis. The two are never both true for a sensible limit and
 * hysteresis ≥ 0; if they are, `active` wins while closed and `clearable` while open.
 */
export function stepCondition(state: ConditionState, active: boolean, clearable: boolean, nowMs: number, holdMs: number): ConditionStep {
  if (state.open) {
    return clearable ? { state: CLOSED, change: "clear" } : unchanged(state);
  }
  if (!active) return state.pendingSinceMs === null ? unchanged(state) : { state: CLOSED, change: null };
  const since = state.pendingSinceMs ?? nowMs;
  if (nowMs - since >= holdMs) return { state: { pendingSinceMs: null, open: true, openSinceMs: since }, change: "raise" };
  return state.pendingSinceMs === null ? { state: { pendingSinceMs: since, open: false, openSinceMs: null }, change: null } : unchanged(state);
}

export type Flags = { active: boolean; clearable: boolean };

/** The usual limit shapes, with the hysteresis on the safe side of the limit. */
export const limits = {
  /** Wrong at or below `limit`; right again above `limit + hysteresis`. */
  atOrBelow: (value: number, limit: number, hysteresis: number): Flags => ({ active: value <= limit, clearable: value > limit + hysteresis }),
  /** Wrong strictly below `limit` (a battery at the limit is still fine); right again at `limit + hysteresis`. */
  below: (value: number, limit: number, hysteresis: number): Flags => ({ active: value < limit, clearable: value >= limit + hysteresis }),
  /** Wrong at or above `limit`; right again below `limit − hysteresis`. */
  atOrAbove: (value: number, limit: number, hysteresis: number): Flags => ({ active: value >= limit, clearable: value < limit - hysteresis }),
};
