// A plug's weekly plan, as the schedule editor sends it whole and the handlers take it:
// its time windows, what the plug does outside them, the season and the skip days.
// Temperatures are °C; the window form types them in the person's unit and converts
// (windowFormSchema). The house's safety limits depend on the stored house and are
// checked by the handler with planLimitIssues.
import { z } from "zod";
import { OUTSIDE_WINDOW_MODES, WINDOW_MODES, type TemperatureUnit } from "@/lib/domain";
import { MAX_DURATION_MIN, validateWindow } from "@/lib/schedule";
import {
  DAY_MIN,
  WEEKDAYS,
  WEEKDAY_NAMES,
  describeDays,
  describeTimes,
  durationBetween,
  findClashes,
  minutesOf,
  timeOf,
  recurrenceFromDays,
} from "@/lib/schedules/week";
import { cToF, fromUnit } from "@/lib/units";
import { line, localDate, recordId, timeOfDay } from "./common";

/**
 * The narrowest band the editor takes: 1 °C between the edges. Common practice for
 * greenhouse thermostats, no published source (see REFERENCES.md, Thermostats); a
 * narrower band makes a heater switch on and off more often than the plug's minimum
 * on/off times are meant to absorb.
 */
export const MIN_DIFFERENTIAL_C = 1;
/** The temperatures a band edge may be given at all; the house's limits narrow it. */
export const EDGE_MIN_C = -10;
export const EDGE_MAX_C = 50;
export const MAX_WINDOWS = 100;
export const MAX_SKIP_DAYS = 366;

/** "2.0 °C (35.6 °F)": the handler does not know the reader's unit, so limits are given in both. */
export function bothUnits(c: number): string {
  return `${c.toFixed(1)} °C (${cToF(c).toFixed(1)} °F)`;
}

const localTime = timeOfDay;

const tenths = (v: number) => Math.abs(v * 10 - Math.round(v * 10)) < 1e-6;

const edge = (label: string) =>
  z
    .number({ error: `${label} must be a number` })
    .min(EDGE_MIN_C, `${label} must be at least ${EDGE_MIN_C} °C`)
    .max(EDGE_MAX_C, `${label} must be at most ${EDGE_MAX_C} °C`)
    .refine(tenths, `${label} is kept to 0.1 °C: round it`)
    .nullable();

type Issue = { path: string; message: string };

/** What is wrong with a band's edges (°C), under the field names `low` and `high`. */
export function bandIssues(lowC: number | null, highC: number | null): Issue[] {
  const issues: Issue[] = [];
  if (lowC === null) issues.push({ path: "low", message: "Give the low edge: the heater comes on at or below it" });
  if (highC === null) issues.push({ path: "high", message: "Give the high edge: the heater goes off at or above it" });
  if (lowC === null || highC === null) return issues;
  if (lowC >= highC) issues.push({ path: "high", message: "The high edge must be above the low edge" });
  else if (highC - lowC < MIN_DIFFERENTIAL_C - 1e-9) {
    issues.push({
      path: "high",
      message: `Keep the edges at least ${MIN_DIFFERENTIAL_C} °C (1.8 °F) apart, so the heater does not switch on and off too often`,
    });
  }
  return issues;
}

export const windowSchema = z
  .object({
    /** A stored window's id; new windows have none. */
    id: recordId("window").optional(),
    days: z
      .array(z.enum(WEEKDAYS, { error: "Days are MO, TU, WE, TH, FR, SA, SU" }), { error: "Days must be a list" })
      .min(1, "Pick at least one day")
      .refine((d) => new Set(d).size === d.length, "A day is listed twice"),
    start: localTime("Start time"),
    durationMin: z
      .number({ error: "Length must be a number of minutes" })
      .int("Length must be whole minutes")
      .min(1, "A window lasts at least a minute")
      .max(MAX_DURATION_MIN, "A window lasts at most a week (7 days)"),
    mode: z.enum(WINDOW_MODES, { error: `Mode must be one of ${WINDOW_MODES.join(", ")}` }),
    lowC: edge("Low edge"),
    highC: edge("High edge"),
  })
  .superRefine((w, ctx) => {
    if (w.mode === "band") {
      for (const i of bandIssues(w.lowC, w.highC)) ctx.addIssue({ code: "custom", path: [i.path === "low" ? "lowC" : "highC"], message: i.message });
    } else if (w.lowC !== null || w.highC !== null) {
      ctx.addIssue({ code: "custom", path: ["mode"], message: "An on or off window has no band: leave the edges empty" });
    }
    const check = validateWindow({ recurrence: recurrenceFromDays(w.days), startsAt: w.start, durationMin: w.durationMin });
    if (!check.ok) ctx.addIssue({ code: "custom", path: ["days"], message: check.error });
  });

export type WindowInput = z.infer<typeof windowSchema>;

export const skipDaySchema = z.object({
  day: localDate("Skip day"),
  note: z.string({ error: "The note must be text" }).trim().max(200, "The note must be at most 200 characters").nullable(),
});

/** "Window 2 (Mon–Fri 06:00–21:00)". */
export function windowLabel(w: Pick<WindowInput, "days" | "start" | "durationMin">, index: number): string {
  return `window ${index + 1} (${describeDays(w.days)} ${describeTimes(w)})`;
}

export const planSchema = z
  .object({
    name: line("Name", 80),
    windows: z.array(windowSchema, { error: "Windows must be a list" }).max(MAX_WINDOWS, `At most ${MAX_WINDOWS} windows`),
    outsideWindows: z.enum(OUTSIDE_WINDOW_MODES, { error: "Outside the windows is either frost protection or off" }),
    frostLowC: edge("Frost protection low edge"),
    frostHighC: edge("Frost protection high edge"),
    validFrom: localDate("Season start").nullable(),
    validUntil: localDate("Season end").nullable(),
    skipDays: z.array(skipDaySchema, { error: "Skip days must be a list" }).max(MAX_SKIP_DAYS, `At most ${MAX_SKIP_DAYS} skip days`),
  })
  .superRefine((plan, ctx) => {
    for (const clash of findClashes(plan.windows)) {
      const other = plan.windows[clash.a]!;
      const message =
        clash.a === clash.b
          ? `This window runs into itself on ${WEEKDAY_NAMES[clash.day]}: shorten it or pick fewer days`
          : `Runs at the same time as ${windowLabel(other, clash.a)} on ${WEEKDAY_NAMES[clash.day]}. Windows may touch but not overlap`;
      ctx.addIssue({ code: "custom", path: ["windows", clash.b], message });
    }
    if (plan.outsideWindows === "frost") {
      for (const i of bandIssues(plan.frostLowC, plan.frostHighC)) {
        ctx.addIssue({ code: "custom", path: [i.path === "low" ? "frostLowC" : "frostHighC"], message: i.message });
      }
    }
    if (plan.validFrom && plan.validUntil && plan.validFrom > plan.validUntil) {
      ctx.addIssue({ code: "custom", path: ["validUntil"], message: "The season must end on or after the day it starts" });
    }
    const seen = new Set<string>();
    plan.skipDays.forEach((s, i) => {
      if (seen.has(s.day)) ctx.addIssue({ code: "custom", path: ["skipDays", i, "day"], message: `${s.day} is listed twice` });
      seen.add(s.day);
    });
  });

export type PlanInput = z.infer<typeof planSchema>;

/** The house's safety limits a plan's bands must keep inside (houses.low_limit_c / high_limit_c). */
export type HouseLimits = { lowLimitC: number; highLimitC: number };

/** Field → message for every band edge outside the house's limits; empty when the plan keeps inside. */
export function planLimitIssues(plan: PlanInput, limits: HouseLimits): Record<string, string> {
  const fields: Record<string, string> = {};
  const check = (lowC: number | null, highC: number | null, lowKey: string, highKey: string) => {
    if (lowC !== null && lowC < limits.lowLimitC) {
      fields[lowKey] = `The low edge is below this house's frost limit of ${bothUnits(limits.lowLimitC)}`;
    }
    if (highC !== null && highC >= limits.highLimitC) {
      fields[highKey] = `The high edge must be below this house's safety cut-out of ${bothUnits(limits.highLimitC)}`;
    }
  };
  plan.windows.forEach((w, i) => {
    if (w.mode === "band") check(w.lowC, w.highC, `windows.${i}.lowC`, `windows.${i}.highC`);
  });
  if (plan.outsideWindows === "frost") check(plan.frostLowC, plan.frostHighC, "frostLowC", "frostHighC");
  return fields;
}

/** The plan's preview request: the draft plan and the stretch of time to show. */
export const PREVIEW_HOURS = [24, 48, 72, 168] as const;
export const previewQuerySchema = z.object({
  from: z.iso.datetime({ error: "from must be an ISO 8601 instant", offset: true }).optional(),
  hours: z.coerce
    .number({ error: "hours must be a number" })
    .int("hours must be whole")
    .min(24, "hours must be from 24 to 168")
    .max(168, "hours must be from 24 to 168")
    .default(24),
});
export const previewBodySchema = previewQuerySchema.extend({
  hours: z.number({ error: "hours must be a number" }).int("hours must be whole").min(24, "hours must be from 24 to 168").max(168, "hours must be from 24 to 168").default(24),
  plan: planSchema,
});

export const plugScheduleParams = z.object({ siteId: recordId("site"), plugId: recordId("plug") });

/** The window form: what a person types (times, an end time, edges in their own unit). */
export function windowFormSchema(unit: TemperatureUnit) {
  return z
    .object({
      days: windowSchema.shape.days,
      start: localTime("Start time"),
      end: localTime("End time"),
      extraDays: z.number({ error: "Pick how many more days" }).int().min(0).max(6),
      mode: windowSchema.shape.mode,
      low: z.number({ error: "The low edge must be a number" }).nullable(),
      high: z.number({ error: "The high edge must be a number" }).nullable(),
    })
    .superRefine((f, ctx) => {
      const durationMin = durationBetween(f.start, f.end, f.extraDays);
      if (durationMin > MAX_DURATION_MIN) ctx.addIssue({ code: "custom", path: ["extraDays"], message: "A window lasts at most a week (7 days)" });
      if (f.mode !== "band") return;
      const lowC = f.low === null ? null : fromUnit(f.low, unit);
      const highC = f.high === null ? null : fromUnit(f.high, unit);
      for (const i of bandIssues(lowC, highC)) ctx.addIssue({ code: "custom", path: [i.path], message: i.message });
      for (const [key, c] of [["low", lowC], ["high", highC]] as const) {
        if (c !== null && (c < EDGE_MIN_C || c > EDGE_MAX_C)) ctx.addIssue({ code: "custom", path: [key], message: `Keep it from ${bothUnits(EDGE_MIN_C)} to ${bothUnits(EDGE_MAX_C)}` });
      }
    })
    .transform(
      (f): Omit<WindowInput, "id"> => ({
        days: f.days,
        start: f.start,
        durationMin: Math.min(durationBetween(f.start, f.end, f.extraDays), MAX_DURATION_MIN),
        mode: f.mode,
        lowC: f.mode === "band" && f.low !== null ? fromUnit(f.low, unit) : null,
        highC: f.mode === "band" && f.high !== null ? fromUnit(f.high, unit) : null,
      }),
    );
}

export type WindowFormValues = z.input<ReturnType<typeof windowFormSchema>>;

/** A window's times as the form shows them: start, end and how many more whole days. */
export function windowFormTimes(w: Pick<WindowInput, "start" | "durationMin">): { start: string; end: string; extraDays: number } {
  const end = timeOf(minutesOf(w.start) + w.durationMin);
  // A window ending at the same time on a later day: the first day is the base length.
  const extraDays = Math.max(0, Math.ceil(w.durationMin / DAY_MIN) - 1);
  return { start: w.start, end, extraDays };
}
