// The override's choices and limits, apart from its zod schema (lib/schemas/override.ts)
// so that the page can show them without loading zod.

/** How long an override lasts: a fixed time, until the schedule's next change, or until a chosen local time. */
export const OVERRIDE_DURATIONS = ["30m", "1h", "3h", "next_change", "until"] as const;
export type OverrideDuration = (typeof OVERRIDE_DURATIONS)[number];

export const OVERRIDE_DURATION_LABELS: Record<OverrideDuration, string> = {
  "30m": "30 min",
  "1h": "1 hour",
  "3h": "3 hours",
  next_change: "Until the schedule changes",
  until: "Until a time I choose",
};

/** The fixed durations, in minutes. */
export const FIXED_DURATION_MIN: Partial<Record<OverrideDuration, number>> = { "30m": 30, "1h": 60, "3h": 180 };

/** The longest an override may run, to a chosen time: a week. */
export const MAX_OVERRIDE_HOURS = 7 * 24;

export const MAX_REASON_LENGTH = 280;
