// The editor's changes to a draft plan, as a reducer: what the grid, the keyboard and the
// list view do to windows, and the sections to the rest. Moving or resizing a window
// changes it on every one of its days (a window is one set of times on several days).
import { MAX_DURATION_MIN } from "@/lib/schedule";
import type { PlanInput, WindowInput } from "@/lib/schemas/schedule";
import { DAY_MIN, SNAP_MIN, WEEKDAYS, minutesOf, sortDays, timeOf, type Weekday } from "./week";

export type PlanAction =
  | { type: "add"; window: WindowInput }
  | { type: "update"; index: number; window: WindowInput }
  | { type: "remove"; index: number }
  /** The window no longer opens on `day`; a window left with no days goes. */
  | { type: "removeDay"; index: number; day: Weekday }
  /** Later (or earlier) by `minutes`, and by `days` whole days; days wrap round the week. */
  | { type: "move"; index: number; minutes: number; days: number }
  /** Longer (or shorter) by `minutes`, from SNAP_MIN to a week. */
  | { type: "resize"; index: number; minutes: number }
  /** Days `to` get `from`'s windows in place of their own. */
  | { type: "copyDay"; from: Weekday; to: Weekday[] }
  | { type: "set"; patch: Partial<Omit<PlanInput, "windows">> }
  | { type: "reset"; plan: PlanInput };

const mod = (n: number, m: number) => ((n % m) + m) % m;

export function shiftDays(days: readonly Weekday[], by: number): Weekday[] {
  return sortDays(days.map((d) => WEEKDAYS[mod(WEEKDAYS.indexOf(d) + by, 7)]!));
}

export function moveWindow(w: WindowInput, minutes: number, days: number): WindowInput {
  const total = minutesOf(w.start) + minutes;
  return { ...w, start: timeOf(total), days: shiftDays(w.days, Math.floor(total / DAY_MIN) + days) };
}

export function resizeWindow(w: WindowInput, minutes: number): WindowInput {
  return { ...w, durationMin: Math.min(MAX_DURATION_MIN, Math.max(SNAP_MIN, w.durationMin + minutes)) };
}

export function copyDay(windows: readonly WindowInput[], from: Weekday, to: readonly Weekday[]): WindowInput[] {
  const targets = to.filter((d) => d !== from);
  return windows
    .map((w) =>
      w.days.includes(from)
        ? { ...w, days: sortDays([...w.days, ...targets.filter((d) => !w.days.includes(d))]) }
        : { ...w, days: w.days.filter((d) => !targets.includes(d)) },
    )
    .filter((w) => w.days.length > 0);
}

export function planReducer(plan: PlanInput, action: PlanAction): PlanInput {
  const windows = plan.windows;
  const replace = (index: number, w: WindowInput) => ({ ...plan, windows: windows.map((x, i) => (i === index ? w : x)) });
  switch (action.type) {
    case "add":
      return { ...plan, windows: [...windows, action.window] };
    case "update":
      return replace(action.index, { ...action.window, id: windows[action.index]?.id });
    case "remove":
      return { ...plan, windows: windows.filter((_, i) => i !== action.index) };
    case "removeDay": {
      const w = windows[action.index];
      if (!w) return plan;
      const days = w.days.filter((d) => d !== action.day);
      return days.length ? replace(action.index, { ...w, days }) : { ...plan, windows: windows.filter((_, i) => i !== action.index) };
    }
    case "move":
      return windows[action.index] ? replace(action.index, moveWindow(windows[action.index]!, action.minutes, action.days)) : plan;
    case "resize":
      return windows[action.index] ? replace(action.index, resizeWindow(windows[action.index]!, action.minutes)) : plan;
    case "copyDay":
      return { ...plan, windows: copyDay(windows, action.from, action.to) };
    case "set":
      return { ...plan, ...action.patch };
    case "reset":
      return action.plan;
  }
}
