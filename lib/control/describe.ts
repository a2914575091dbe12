import { SWITCH_CAUSE_LABELS } from "@/lib/domain";
import type { Decision } from "./types";

/** One line for people, shared by the pages and the switch log: "Schedule: at or below 8 °C low edge". */
export function describeCause(decision: Pick<Decision, "cause" | "reason">): string {
  return `${SWITCH_CAUSE_LABELS[decision.cause]}: ${decision.reason}`;
}
