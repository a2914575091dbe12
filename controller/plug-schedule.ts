// One plug's schedules, compiled for the hot path and compiled again when time runs
// past the horizon. A plug without schedules (or with one that cannot be compiled)
// has no window, so its default outside windows applies.
import { activeAt, compileSchedule, covers, nextChangeAt, type CompiledSchedule, type Occurrence, type Schedule } from "@/lib/schedule";

export type PlugSchedule = {
  activeAt: (ms: number) => Occurrence | null;
  /** The next instant the window in force changes, or null when nothing is scheduled. */
  nextChangeAfter: (ms: number) => number | null;
  error: string | null;
};

const NONE: PlugSchedule = { activeAt: () => null, nextChangeAfter: () => null, error: null };

export function compilePlugSchedule(schedules: Schedule[], timeZone: string, onError?: (message: string) => void): PlugSchedule {
  if (schedules.length === 0 || schedules.every((s) => s.windows.length === 0)) return NONE;
  let compiled: CompiledSchedule | null = null;
  let error: string | null = null;

  const at = (ms: number): CompiledSchedule | null => {
    if (compiled && covers(compiled, ms)) return compiled;
    try {
      compiled = compileSchedule(schedules, timeZone, ms);
      return compiled;
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
      onError?.(error);
      return null;
    }
  };

  return {
    activeAt: (ms) => {
      const c = at(ms);
      return c ? activeAt(c, ms) : null;
    },
    nextChangeAfter: (ms) => {
      const c = at(ms);
      if (!c) return null;
      const next = nextChangeAt(c, ms);
      if (next !== null) return next;
      // Nothing up to the horizon: look once more from its end.
      const later = at(c.until);
      return later ? nextChangeAt(later, c.until) : null;
    },
    get error() {
      return error;
    },
  };
}
