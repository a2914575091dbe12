import type { WindowMode } from "@/lib/domain";

export type { WindowMode };

/** A recurring time window, as stored (db/schema/schedules.ts). */
export type ScheduleWindow = {
  id: string;
  /** RRULE value without DTSTART, e.g. "FREQ=WEEKLY;BYDAY=MO,TU" (see validateRecurrence). */
  recurrence: string;
  /** Local opening time "HH:MM:SS" (or "HH:MM"). */
  startsAt: string;
  /** 1 to MAX_DURATION_MIN minutes of wall-clock time. */
  durationMin: number;
  mode: WindowMode;
  lowC: number | null;
  highC: number | null;
};

/** One of a plug's schedules with its windows and skip days, in the site's time zone. */
export type Schedule = {
  id: string;
  /** Season: first and last local date "YYYY-MM-DD" on which windows open (inclusive); null = open-ended. */
  validFrom: string | null;
  validUntil: string | null;
  windows: ScheduleWindow[];
  /** Local dates "YYYY-MM-DD" on which no window opens. */
  skipDays: string[];
};

/** One occurrence of a window, opening and closing at real instants. */
export type ActiveWindow = {
  scheduleId: string;
  window: ScheduleWindow;
  opensAt: Date;
  closesAt: Date;
};

/** The same occurrence in epoch ms, as the compiled fast path holds it. */
export type Occurrence = {
  readonly scheduleId: string;
  readonly window: ScheduleWindow;
  readonly opensMs: number;
  readonly closesMs: number;
};
