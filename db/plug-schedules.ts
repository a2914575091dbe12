// Plugs' schedules (windows, skip days, season) and the overrides that are or will be
// in force: what the controller compiles, and what the pages' "in force now", "next
// change" and previews are worked out from (lib/control/plan.ts), read one way.
import { and, desc, eq, gt, inArray, isNull, or } from "drizzle-orm";
import type { Database } from "@/db/client";
import { overrides, scheduleExceptions, scheduleWindows, schedules } from "@/db/schema";
import { groupBy } from "@/lib/group-by";
import type { Schedule } from "@/lib/schedule";

export type ScheduleConfig = Schedule & { plugId: string };

export type OverrideConfig = {
  id: string;
  plugId: string;
  on: boolean;
  startsAt: Date;
  endsAt: Date | null;
  untilNextChange: boolean;
  userId: string | null;
};

/** The schedules of these plugs and their overrides not cancelled and not yet ended at `now` (latest first). */
export async function loadPlugSchedules(
  db: Pick<Database, "select">,
  plugIds: string[],
  now: Date,
): Promise<{ schedules: ScheduleConfig[]; overrides: OverrideConfig[] }> {
  const [plugSchedules, plugOverrides] = await Promise.all([loadSchedulesOfPlugs(db, plugIds), loadOverridesInForce(db, plugIds, now)]);
  return { schedules: plugSchedules, overrides: plugOverrides };
}

/** The overrides of these plugs not cancelled and not yet ended at `now`, latest first. */
export async function loadOverridesInForce(db: Pick<Database, "select">, plugIds: string[], now: Date): Promise<OverrideConfig[]> {
  if (plugIds.length === 0) return [];
  return db
    .select({
      id: overrides.id,
      plugId: overrides.plugId,
      on: overrides.on,
      startsAt: overrides.startsAt,
      endsAt: overrides.endsAt,
      untilNextChange: overrides.untilNextChange,
      userId: overrides.userId,
    })
    .from(overrides)
    .where(and(inArray(overrides.plugId, plugIds), isNull(overrides.cancelledAt), or(isNull(overrides.endsAt), gt(overrides.endsAt, now))))
    .orderBy(desc(overrides.startsAt));
}

/** The schedules of these plugs with their windows and skip days. */
export async function loadSchedulesOfPlugs(db: Pick<Database, "select">, plugIds: string[]): Promise<ScheduleConfig[]> {
  if (plugIds.length === 0) return [];
  const [scheduleRows, windowRows, skipRows] = await Promise.all([
    db.select().from(schedules).where(inArray(schedules.plugId, plugIds)),
    db
      .select({ window: scheduleWindows })
      .from(scheduleWindows)
      .innerJoin(schedules, eq(schedules.id, scheduleWindows.scheduleId))
      .where(inArray(schedules.plugId, plugIds)),
    db
      .select({ scheduleId: scheduleExceptions.scheduleId, day: scheduleExceptions.day })
      .from(scheduleExceptions)
      .innerJoin(schedules, eq(schedules.id, scheduleExceptions.scheduleId))
      .where(inArray(schedules.plugId, plugIds)),
  ]);
  const windowsOf = groupBy(windowRows, (w) => w.window.scheduleId);
  const skipDaysOf = groupBy(skipRows, (k) => k.scheduleId);
  return scheduleRows.map((s) => ({
    id: s.id,
    plugId: s.plugId,
    validFrom: s.validFrom,
    validUntil: s.validUntil,
    windows: (windowsOf.get(s.id) ?? []).map(({ window: w }) => ({
      id: w.id,
      recurrence: w.recurrence,
      startsAt: w.startsAt,
      durationMin: w.durationMin,
      mode: w.mode,
      lowC: w.lowC,
      highC: w.highC,
    })),
    skipDays: (skipDaysOf.get(s.id) ?? []).map((k) => k.day),
  }));
}
