// When an override ends: worked out once, when it is made, from what the person chose.
// "Until the schedule changes" is stored as such (ends_at null) and the controller ends
// it at the schedule's next change after its start; the page shows that instant.
import { AppError } from "./errors";
import { toInstant } from "./schedule";
import { FIXED_DURATION_MIN, MAX_OVERRIDE_HOURS, type OverrideInput } from "./schemas/override";

export type OverrideEnd = { endsAt: Date | null; untilNextChange: boolean };

const MINUTE_MS = 60_000;

/**
 * The end of an override made at `now`. `nextChange` is the plug's next schedule
 * change after `now` (lib/schedule's nextChange), null when none is coming. Throws a
 * bad_input AppError naming the field for an end in the past, too far ahead, or a
 * schedule with no change to wait for.
 */
export function overrideEnd(input: Pick<OverrideInput, "duration" | "until">, now: Date, timeZone: string, nextChange: Date | null): OverrideEnd {
  const fixed = FIXED_DURATION_MIN[input.duration];
  if (fixed !== undefined) return { endsAt: new Date(now.getTime() + fixed * MINUTE_MS), untilNextChange: false };
  if (input.duration === "next_change") {
    if (nextChange === null) {
      throw new AppError("bad_input", "This plug has no schedule change coming: choose a duration or an end time instead.", {
        duration: "no schedule change is coming",
      });
    }
    return { endsAt: null, untilNextChange: true };
  }
  if (!input.until) throw new AppError("bad_input", "until: Choose the time the override ends", { until: "Choose the time the override ends" });
  const endsAt = toInstant(input.until, timeZone);
  if (endsAt.getTime() <= now.getTime() + MINUTE_MS) {
    throw new AppError("bad_input", "until: The end time must be at least a minute from now", {
      until: "must be at least a minute from now",
    });
  }
  if (endsAt.getTime() > now.getTime() + MAX_OVERRIDE_HOURS * 60 * MINUTE_MS) {
    throw new AppError("bad_input", `until: The end time must be within ${MAX_OVERRIDE_HOURS / 24} days`, {
      until: `must be within ${MAX_OVERRIDE_HOURS / 24} days`,
    });
  }
  return { endsAt, untilNextChange: false };
}

/**
 * When a stored override stops acting: its end (lib/control/plan.ts `overrideEndsAt`,
 * as the controller judges it; null: it runs until cancelled), or its cancellation
 * when that came first.
 */
export function overrideStopsAt(o: { cancelledAt: Date | null }, end: Date | null): Date | null {
  if (o.cancelledAt && (end === null || o.cancelledAt < end)) return o.cancelledAt;
  return end;
}
