// One plug's schedules, compiled for the hot path and compiled again when time runs
// past the horizon. A plug without schedules (or with one that cannot be compiled)
// has no window, so its default outside windows applies.
import { activeAt, compileSchedule, covers, nextChangeAt, type CompiledSchedule, type Schedule } from "@/lib/schedule";
import { sharedWindow, type ActiveWindow } from "@/lib/control";

export type PlugSchedule = {
  /** The rule of the window in force at `ms`, or null outside windows. */
  activeAt: (ms: number) => ActiveWindow;
  /** The next instant the window in force changes, or null when nothing is scheduled. */
  nextChangeAfter: (ms: number) => number | null;
  error: string | null;
};

const NONE: PlugSchedule = { activeAt: () => null, nextChangeAfter: () => null, error: null };

export function compilePlugSchedule(schedules: Schedule[], timeZone: string, onError?: (message: string) => void): PlugSchedule {
  if (schedules.length === 0 || schedules.every((s) => s.windows.length === 0)) return NONE;
  return new CompilingSchedule(schedules, timeZone, onError);
}

// A class rather than closures: a tick reads every plug's schedule, and one object per
// plug (its fields side by side) is one memory read instead of three.
class CompilingSchedule implements PlugSchedule {
  error: string | null = null;
  private compiled: CompiledSchedule | null = null;
  // The answer last given and the span it holds for: a tick asks every plug every
  // second, and its window changes only at an edge, so most questions end here.
  private knownFrom = 0;
  private knownUntil = -1;
  private known: ActiveWindow = null;

  constructor(
    private readonly schedules: Schedule[],
    private readonly timeZone: string,
    private readonly onError?: (message: string) => void,
  ) {}

  activeAt(ms: number): ActiveWindow {
    if (ms >= this.knownFrom && ms < this.knownUntil) return this.known;
    const c = this.at(ms);
    if (!c) return null;
    const occurrence = activeAt(c, ms);
    this.known = occurrence && sharedWindow(occurrence.window);
    this.knownFrom = ms;
    this.knownUntil = nextChangeAt(c, ms) ?? c.until;
    return this.known;
  }

  nextChangeAfter(ms: number): number | null {
    const c = this.at(ms);
    if (!c) return null;
    const next = nextChangeAt(c, ms);
    if (next !== null) return next;
    // Nothing up to the horizon: look once more from its end.
    const later = this.at(c.until);
    return later ? nextChangeAt(later, c.until) : null;
  }

  private at(ms: number): CompiledSchedule | null {
    if (this.compiled && covers(this.compiled, ms)) return this.compiled;
    try {
      this.compiled = compileSchedule(this.schedules, this.timeZone, ms);
      return this.compiled;
    } catch (e) {
      this.error = e instanceof Error ? e.message : String(e);
      this.onError?.(this.error);
      return null;
    }
  }
}
