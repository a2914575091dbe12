// Between the stored schedules of a plug (lib/schedule's Schedule) and the editor's one
// weekly plan, and what the preview says about daylight-saving days.
import { DateTime } from "luxon";
import type { OutsideWindowMode } from "@/lib/domain";
import type { Schedule } from "@/lib/schedule";
import type { PlanInput, WindowInput } from "@/lib/schemas/schedule";
import { daysFromRecurrence, recurrenceFromDays } from "./week";

/** The plug's settings outside its windows (plugs.outside_windows, frost_low_c, frost_high_c). */
export type OutsideSettings = { outsideWindows: OutsideWindowMode; frostLowC: number | null; frostHighC: number | null };

export type StoredSchedule = Schedule & { name: string; skipNotes?: Record<string, string | null> };

/**
 * The plug's schedules as one plan. The editor keeps one schedule per plug; a plug with
 * several (made before the editor) is shown with all their windows, the first one's
 * name and season and every skip day, and saving joins them into that one.
 * Windows whose rule the editor cannot show as weekdays are reported, not dropped silently.
 */
export function planFromSchedules(
  stored: StoredSchedule[],
  outside: OutsideSettings,
): { plan: PlanInput; unreadable: string[] } {
  const unreadable: string[] = [];
  const windows: WindowInput[] = [];
  for (const s of stored) {
    for (const w of s.windows) {
      const days = daysFromRecurrence(w.recurrence);
      if (!days) {
        unreadable.push(w.id);
        continue;
      }
      windows.push({ id: w.id, days, start: w.startsAt.slice(0, 5), durationMin: w.durationMin, mode: w.mode, lowC: w.lowC, highC: w.highC });
    }
  }
  const skip = new Map<string, string | null>();
  for (const s of stored) for (const day of s.skipDays) if (!skip.has(day)) skip.set(day, s.skipNotes?.[day] ?? null);
  const first = stored[0];
  return {
    plan: {
      name: first?.name ?? "Weekly plan",
      windows: windows.sort((a, b) => (a.start < b.start ? -1 : a.start > b.start ? 1 : 0)),
      outsideWindows: outside.outsideWindows,
      frostLowC: outside.frostLowC,
      frostHighC: outside.frostHighC,
      validFrom: first?.validFrom ?? null,
      validUntil: first?.validUntil ?? null,
      skipDays: [...skip].sort(([a], [b]) => (a < b ? -1 : 1)).map(([day, note]) => ({ day, note })),
    },
    unreadable,
  };
}

/** A plan as lib/schedule resolves it; windows without an id get one for the preview only. */
export function scheduleFromPlan(plan: PlanInput, scheduleId: string): Schedule {
  return {
    id: scheduleId,
    validFrom: plan.validFrom,
    validUntil: plan.validUntil,
    windows: plan.windows.map((w, i) => ({
      id: w.id ?? `draft-${i}`,
      recurrence: recurrenceFromDays(w.days),
      startsAt: `${w.start}:00`,
      durationMin: w.durationMin,
      mode: w.mode,
      lowC: w.mode === "band" ? w.lowC : null,
      highC: w.mode === "band" ? w.highC : null,
    })),
    skipDays: plan.skipDays.map((s) => s.day),
  };
}

/** The plug's settings outside windows as stored: frost edges are kept only for frost protection. */
export function outsideFromPlan(plan: PlanInput): OutsideSettings {
  return plan.outsideWindows === "frost"
    ? { outsideWindows: "frost", frostLowC: plan.frostLowC, frostHighC: plan.frostHighC }
    : { outsideWindows: "off", frostLowC: null, frostHighC: null };
}

/** A local day whose length is not 24 hours: the clocks go forward (23 h) or back (25 h). */
export type ClockChangeDay = { date: string; hours: number };

/** The local days from `from` to `until` in `timeZone` on which the clocks change (IANA rules through luxon/Intl). */
export function clockChangeDays(timeZone: string, from: Date, until: Date): ClockChangeDay[] {
  const days: ClockChangeDay[] = [];
  let day = DateTime.fromJSDate(from, { zone: timeZone }).startOf("day");
  const end = until.getTime();
  for (let i = 0; i < 10 && day.toMillis() < end; i++) {
    const next = day.plus({ days: 1 }).startOf("day");
    const hours = (next.toMillis() - day.toMillis()) / 3_600_000;
    if (hours !== 24) days.push({ date: day.toISODate()!, hours });
    day = next;
  }
  return days;
}
