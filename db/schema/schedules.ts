import { date, decimal, index, mysqlEnum, mysqlTable, smallint, text, time, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { WINDOW_MODES } from "../../lib/domain";
import { createdAt, id, ref, updatedAt } from "./columns";
import { plugs } from "./devices";

/** A plug's weekly plan, valid for a season, in the site's time zone. */
export const schedules = mysqlTable(
  "schedules",
  {
    id: id(),
    plugId: ref("plug_id")
      .notNull()
      .references(() => plugs.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 80 }).notNull(),
    /** Season: first and last local date on which the schedule applies (inclusive). */
    validFrom: date("valid_from", { mode: "string" }),
    validUntil: date("valid_until", { mode: "string" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("schedules_plug_idx").on(t.plugId)],
);

/**
 * A recurring time window. `recurrence` is an RFC 5545 RRULE (without DTSTART), such
 * as `FREQ=WEEKLY;BYDAY=MO,TU,WE`; the window opens at `startsAt` local time and lasts
 * `durationMin` minutes.
 */
export const scheduleWindows = mysqlTable(
  "schedule_windows",
  {
    id: id(),
    scheduleId: ref("schedule_id")
      .notNull()
      .references(() => schedules.id, { onDelete: "cascade" }),
    recurrence: varchar("recurrence", { length: 255 }).notNull(),
    startsAt: time("starts_at").notNull(),
    durationMin: smallint("duration_min", { unsigned: true }).notNull(),
    mode: mysqlEnum("mode", WINDOW_MODES).notNull(),
    /** Band: heat comes on at or below the low edge and goes off at or above the high edge. */
    lowC: decimal("low_c", { precision: 4, scale: 1, mode: "number" }),
    highC: decimal("high_c", { precision: 4, scale: 1, mode: "number" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("schedule_windows_schedule_idx").on(t.scheduleId)],
);

/** A local date on which the schedule's windows do not open (like RFC 5545 EXDATE), e.g. a holiday. */
export const scheduleExceptions = mysqlTable(
  "schedule_exceptions",
  {
    id: id(),
    scheduleId: ref("schedule_id")
      .notNull()
      .references(() => schedules.id, { onDelete: "cascade" }),
    day: date("day", { mode: "string" }).notNull(),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("schedule_exceptions_day_uq").on(t.scheduleId, t.day)],
);
