import type { Cause, Decision } from "./types";

export const CAUSE_LABELS: Record<Cause, string> = {
  safety: "Safety cut-out",
  override: "Override",
  schedule: "Schedule",
  default: "Outside windows",
  failsafe: "Sensor quiet, fail-safe",
};

/** One line for people, shared by the pages and the switch log: "Schedule: at or below 8 °C low edge". */
export function describeCause(decision: Pick<Decision, "cause" | "reason">): string {
  return `${CAUSE_LABELS[decision.cause]}: ${decision.reason}`;
}
