// What rule a plug follows now and over the coming hours: an override, a time window
// (band or plain on/off), or the default outside windows. The same precedence and the
// same schedule resolution as the controller (lib/schedule, controller/switching.ts),
// so the pages' "in force now", "next change" and the schedule preview say what the
// controller will do. The safety cut-out, the stale-sensor fail-safe and the
// anti-short-cycle guard depend on readings and are left to the decision.
import type { OutsideWindowMode } from "../domain";
import { nextChange, activeWindow, type Schedule } from "../schedule";

export type PlanOverride = {
  id: string;
  on: boolean;
  startsAt: Date;
  /** Null with `untilNextChange` (it ends at the schedule's next change after its start) or open-ended. */
  endsAt: Date | null;
  untilNextChange: boolean;
};

export type PlanInput = {
  schedules: Schedule[];
  timeZone: string;
  outsideWindows: OutsideWindowMode;
  frostLowC: number | null;
  frostHighC: number | null;
  /** Overrides not cancelled; ended ones are ignored. */
  overrides: PlanOverride[];
};

export type PlanRule =
  | { kind: "override"; overrideId: string; on: boolean }
  | { kind: "window"; scheduleId: string; windowId: string; mode: "band"; lowC: number | null; highC: number | null }
  | { kind: "window"; scheduleId: string; windowId: string; mode: "on" | "off" }
  | { kind: "frost"; lowC: number | null; highC: number | null }
  | { kind: "off" };

export type PlanSegment = { from: Date; until: Date; rule: PlanRule };

export type InForce = {
  rule: PlanRule;
  /** When this rule gives way to another, or null when nothing changes any more. */
  until: Date | null;
  /** The rule that follows, when there is one. */
  next: PlanRule | null;
};

/** When an override ends: its end, the schedule's next change after its start, or never (null). */
export function overrideEndsAt(override: PlanOverride, schedules: Schedule[], timeZone: string): Date | null {
  if (override.endsAt) return override.endsAt;
  if (!override.untilNextChange) return null;
  return nextChange(schedules, timeZone, override.startsAt);
}

type TimedOverride = PlanOverride & { endsMs: number };

function timed(input: PlanInput): TimedOverride[] {
  return input.overrides
    .map((o) => ({ ...o, endsMs: overrideEndsAt(o, input.schedules, input.timeZone)?.getTime() ?? Number.POSITIVE_INFINITY }))
    .sort((a, b) => b.startsAt.getTime() - a.startsAt.getTime());
}

function ruleAt(input: PlanInput, overrides: TimedOverride[], at: Date): PlanRule {
  const ms = at.getTime();
  // The latest-started override in force wins, as in the controller.
  const override = overrides.find((o) => o.startsAt.getTime() <= ms && ms < o.endsMs);
  if (override) return { kind: "override", overrideId: override.id, on: override.on };
  const active = activeWindow(input.schedules, input.timeZone, at);
  if (active) {
    const w = active.window;
    return w.mode === "band"
      ? { kind: "window", scheduleId: active.scheduleId, windowId: w.id, mode: "band", lowC: w.lowC, highC: w.highC }
      : { kind: "window", scheduleId: active.scheduleId, windowId: w.id, mode: w.mode };
  }
  return input.outsideWindows === "frost" ? { kind: "frost", lowC: input.frostLowC, highC: input.frostHighC } : { kind: "off" };
}

function nextBoundary(input: PlanInput, overrides: TimedOverride[], at: Date): Date | null {
  const ms = at.getTime();
  let next = nextChange(input.schedules, input.timeZone, at)?.getTime() ?? Number.POSITIVE_INFINITY;
  for (const o of overrides) {
    const starts = o.startsAt.getTime();
    if (starts > ms && starts < next) next = starts;
    if (o.endsMs > ms && o.endsMs < next) next = o.endsMs;
  }
  return Number.isFinite(next) ? new Date(next) : null;
}

export function sameRule(a: PlanRule, b: PlanRule): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * The rules in force from `from` to `until`, as segments that touch; neighbouring
 * boundaries where nothing changes for the plug (one occurrence of a window followed
 * directly by the next with the same settings) are merged.
 */
export function planSegments(input: PlanInput, from: Date, until: Date): PlanSegment[] {
  const overrides = timed(input);
  const segments: PlanSegment[] = [];
  let cursor = from;
  // Each step passes at least one window boundary or override edge; a week of windows
  // every few minutes stays well within this bound.
  for (let steps = 0; cursor < until && steps < 10_000; steps++) {
    const rule = ruleAt(input, overrides, cursor);
    const boundary = nextBoundary(input, overrides, cursor);
    const end = boundary === null || boundary > until ? until : boundary;
    const last = segments.at(-1);
    if (last && sameRule(last.rule, rule)) last.until = end;
    else segments.push({ from: cursor, until: end, rule });
    cursor = end;
  }
  return segments;
}

/** The rule in force at `at`, when it changes, and what follows. */
export function inForceAt(input: PlanInput, at: Date): InForce {
  const overrides = timed(input);
  const rule = ruleAt(input, overrides, at);
  let cursor = at;
  // Skip boundaries that change nothing for the plug (back-to-back identical windows).
  for (let steps = 0; steps < 1_000; steps++) {
    const boundary = nextBoundary(input, overrides, cursor);
    if (boundary === null) return { rule, until: null, next: null };
    const next = ruleAt(input, overrides, boundary);
    if (!sameRule(next, rule)) return { rule, until: boundary, next };
    cursor = boundary;
  }
  return { rule, until: null, next: null };
}
