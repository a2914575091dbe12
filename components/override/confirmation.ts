// Whether a press has been confirmed by the plug itself. Pure, so the page, its
// fallback and the tests judge it the same way.

/** How long a press waits for the plug's report before the page says it has not answered. */
export const CONFIRM_WAIT_MS = 10_000;

export type Confirmation =
  /** The plug's own report shows the state asked for. */
  | { kind: "confirmed"; already: boolean }
  | { kind: "waiting" }
  /** The plug is known to be offline. */
  | { kind: "offline" }
  /** No confirming report within CONFIRM_WAIT_MS. */
  | { kind: "no_answer" };

export type Press = {
  on: boolean;
  /** When the override started, on the server's clock. */
  startsAtMs: number;
  /** When the press was answered, on this browser's clock. */
  answeredAtMs: number;
};

/** The plug's newest report: its state, and when the server heard it (server clock; null when not known). */
export type HeardReport = { on: boolean; receivedAtMs: number | null };

export function confirmationOf(press: Press, report: HeardReport | null, online: boolean | null, nowMs: number): Confirmation {
  // The newest report is what the plug is now: the state asked for, whether it switched
  // after the press or was already so with the override in force.
  if (report && report.on === press.on) {
    return { kind: "confirmed", already: report.receivedAtMs !== null && report.receivedAtMs < press.startsAtMs };
  }
  if (online === false) return { kind: "offline" };
  if (nowMs - press.answeredAtMs >= CONFIRM_WAIT_MS) return { kind: "no_answer" };
  return { kind: "waiting" };
}

/** This browser's clock, read when a press is answered. */
export const clockMs = () => Date.now();
