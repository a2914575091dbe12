// The schedule preview: what the plug would follow over the coming hours under a plan
// (saved or draft), worked out by the controller's own precedence (lib/control/plan.ts).
import { planSegments, type PlanOverride, type PlanRule } from "@/lib/control/plan";
import type { PlanInput } from "@/lib/schemas/schedule";
import { clockChangeDays, outsideFromPlan, scheduleFromPlan, type ClockChangeDay } from "./plan";

export const PREVIEW_SCHEDULE_ID = "plan";

export type PreviewSegment = {
  from: string;
  until: string;
  rule: PlanRule;
  /** The plan's window in force (its place in the plan's list), when the rule is a window. */
  windowIndex: number | null;
};

export type Preview = { timeZone: string; from: string; until: string; segments: PreviewSegment[]; clockChanges: ClockChangeDay[] };

export function previewPlan({
  plan,
  timeZone,
  overrides,
  from,
  hours,
}: {
  plan: PlanInput;
  timeZone: string;
  overrides: PlanOverride[];
  from: Date;
  hours: number;
}): Preview {
  const schedule = scheduleFromPlan(plan, PREVIEW_SCHEDULE_ID);
  const until = new Date(from.getTime() + hours * 3_600_000);
  const segments = planSegments({ schedules: [schedule], timeZone, overrides, ...outsideFromPlan(plan) }, from, until);
  const indexOf = new Map(schedule.windows.map((w, i) => [w.id, i]));
  return {
    timeZone,
    from: from.toISOString(),
    until: until.toISOString(),
    segments: segments.map((s) => ({
      from: s.from.toISOString(),
      until: s.until.toISOString(),
      rule: s.rule,
      windowIndex: s.rule.kind === "window" ? (indexOf.get(s.rule.windowId) ?? null) : null,
    })),
    clockChanges: clockChangeDays(timeZone, from, until),
  };
}
