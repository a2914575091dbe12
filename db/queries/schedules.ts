import "server-only";
import { and, asc, eq, inArray, isNull } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb, type Database } from "@/db/client";
import { loadPlugSchedules, type OverrideConfig } from "@/db/plug-schedules";
import { houses, plugs, scheduleExceptions, scheduleWindows, schedules } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { planLimitIssues, type PlanInput } from "@/lib/schemas/schedule";
import { outsideFromPlan, planFromSchedules, type StoredSchedule } from "@/lib/schedules/plan";
import { recurrenceFromDays } from "@/lib/schedules/week";
import { describeWindow } from "@/lib/schedules/format";
import { transactionWithRetry } from "@/db/transaction";
import { recordAudit } from "./audit";

/** A plan as the activity page lists it: each window and skip day in words (°C, as stored), so a change reads as what changed. */
function planInWords(plan: PlanInput) {
  return {
    ...plan,
    windows: plan.windows.map((w) => describeWindow(w, "c")),
    skipDays: plan.skipDays.map((s) => (s.note ? `${s.day} (${s.note})` : s.day)),
  };
}

/** The plug a schedule belongs to, with its house's safety limits. */
export type SchedulePlug = {
  id: string;
  siteId: string;
  deviceId: string;
  name: string;
  applianceKind: (typeof plugs.$inferSelect)["applianceKind"];
  houseId: string;
  houseName: string;
  lowLimitC: number;
  highLimitC: number;
  outsideWindows: (typeof plugs.$inferSelect)["outsideWindows"];
  frostLowC: number | null;
  frostHighC: number | null;
};

type Reader = Pick<Database, "select">;

const plugColumns = {
  id: plugs.id,
  siteId: plugs.siteId,
  deviceId: plugs.deviceId,
  name: plugs.name,
  applianceKind: plugs.applianceKind,
  houseId: plugs.houseId,
  houseName: houses.name,
  lowLimitC: houses.lowLimitC,
  highLimitC: houses.highLimitC,
  outsideWindows: plugs.outsideWindows,
  frostLowC: plugs.frostLowC,
  frostHighC: plugs.frostHighC,
};

/** A working plug of the site; 404 when it is not there (or another site's), 409 when it is retired. */
export async function requireSchedulePlug({ siteId, plugId }: { siteId: string; plugId: string }): Promise<SchedulePlug> {
  const [row] = await getDb()
    .select({ ...plugColumns, retiredAt: plugs.retiredAt })
    .from(plugs)
    .innerJoin(houses, eq(houses.id, plugs.houseId))
    .where(and(eq(plugs.siteId, siteId), eq(plugs.id, plugId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such plug in this site.");
  const { retiredAt, ...plug } = row;
  if (retiredAt) throw new AppError("conflict", "This plug is retired: it is no longer switched, so it has no schedule to edit.");
  return plug;
}

/** The loader of the plug's schedule handlers (siteRoute's `load`). */
export const loadSchedulePlug = ({ site, params }: { site: { id: string }; params: { plugId: string } }) =>
  requireSchedulePlug({ siteId: site.id, plugId: params.plugId });

/** The plugs' schedules with their names and skip-day notes, oldest schedule first. */
async function readSchedules(db: Reader, plugIds: string[], now: Date) {
  const loaded = await loadPlugSchedules(db, plugIds, now);
  if (plugIds.length === 0) return { schedules: new Map<string, StoredSchedule[]>(), overrides: [] as OverrideConfig[] };
  const [names, notes] = await Promise.all([
    db
      .select({ id: schedules.id, name: schedules.name })
      .from(schedules)
      .where(inArray(schedules.plugId, plugIds))
      .orderBy(asc(schedules.createdAt), asc(schedules.id)),
    db
      .select({ scheduleId: scheduleExceptions.scheduleId, day: scheduleExceptions.day, note: scheduleExceptions.note })
      .from(scheduleExceptions)
      .innerJoin(schedules, eq(schedules.id, scheduleExceptions.scheduleId))
      .where(inArray(schedules.plugId, plugIds)),
  ]);
  const byId = new Map(loaded.schedules.map((s) => [s.id, s]));
  const byPlug = new Map<string, StoredSchedule[]>();
  for (const { id, name } of names) {
    const s = byId.get(id);
    if (!s) continue;
    const skipNotes = Object.fromEntries(notes.filter((n) => n.scheduleId === id).map((n) => [n.day, n.note]));
    byPlug.set(s.plugId, [...(byPlug.get(s.plugId) ?? []), { ...s, name, skipNotes }]);
  }
  return { schedules: byPlug, overrides: loaded.overrides };
}

export type PlugPlan = Awaited<ReturnType<typeof getPlugPlan>>;

/** The plug's weekly plan as the editor shows it, and the overrides in force or to come. */
export async function getPlugPlan(plug: SchedulePlug, db: Reader = getDb(), now = new Date()) {
  const { schedules: byPlug, overrides } = await readSchedules(db, [plug.id], now);
  const stored = byPlug.get(plug.id) ?? [];
  const { plan, unreadable } = planFromSchedules(stored, plug);
  return {
    plan,
    /** How many schedule rows the plan was read from (more than one are joined on save). */
    scheduleCount: stored.length,
    /** Windows with a rule the editor cannot show as weekdays; saving would drop them, so it is refused. */
    unreadable,
    overrides: overrides.map(({ id, on, startsAt, endsAt, untilNextChange }) => ({ id, on, startsAt, endsAt, untilNextChange })),
  };
}

/** Throws a 400 naming each band edge outside the house's limits. */
export function assertInsideLimits(plan: PlanInput, plug: SchedulePlug) {
  const fields = planLimitIssues(plan, plug);
  const first = Object.values(fields)[0];
  if (first) throw new AppError("bad_input", first, fields);
}

/**
 * Replaces the plug's plan: one schedule (the oldest kept, the others joined into it),
 * its windows and skip days, and the plug's settings outside windows, in one
 * transaction with its audit row.
 */
export async function replacePlugPlan({ plug, userId, plan }: { plug: SchedulePlug; userId: string; plan: PlanInput }) {
  assertInsideLimits(plan, plug);
  const now = new Date();
  await transactionWithRetry(getDb(), async (tx) => {
    // Read and lock the plug's row first, so two saves of one plug follow one another.
    await tx.select({ id: plugs.id }).from(plugs).where(eq(plugs.id, plug.id)).for("update");
    const before = await getPlugPlan(plug, tx, now);
    if (before.unreadable.length > 0) {
      throw new AppError("conflict", "This plug has windows with rules the editor cannot show; they would be lost by saving here.");
    }
    const existing = await tx
      .select({ id: schedules.id })
      .from(schedules)
      .where(eq(schedules.plugId, plug.id))
      .orderBy(asc(schedules.createdAt), asc(schedules.id));
    const scheduleId = existing[0]?.id ?? randomUUID();
    const others = existing.slice(1).map((s) => s.id);
    if (others.length) await tx.delete(schedules).where(inArray(schedules.id, others));
    if (existing[0]) {
      await tx.update(schedules).set({ name: plan.name, validFrom: plan.validFrom, validUntil: plan.validUntil }).where(eq(schedules.id, scheduleId));
    } else {
      await tx.insert(schedules).values({ id: scheduleId, plugId: plug.id, name: plan.name, validFrom: plan.validFrom, validUntil: plan.validUntil });
    }
    await tx.delete(scheduleWindows).where(eq(scheduleWindows.scheduleId, scheduleId));
    await tx.delete(scheduleExceptions).where(eq(scheduleExceptions.scheduleId, scheduleId));
    // A window keeps its id when it was the plug's already; anything else gets a new one.
    const known = new Set(before.plan.windows.map((w) => w.id));
    const windows = plan.windows.map((w) => ({
      id: w.id && known.has(w.id) ? w.id : randomUUID(),
      scheduleId,
      recurrence: recurrenceFromDays(w.days),
      startsAt: `${w.start}:00`,
      durationMin: w.durationMin,
      mode: w.mode,
      lowC: w.mode === "band" ? w.lowC : null,
      highC: w.mode === "band" ? w.highC : null,
    }));
    if (windows.length) await tx.insert(scheduleWindows).values(windows);
    if (plan.skipDays.length) {
      await tx.insert(scheduleExceptions).values(plan.skipDays.map((s) => ({ scheduleId, day: s.day, note: s.note || null })));
    }
    await tx.update(plugs).set(outsideFromPlan(plan)).where(and(eq(plugs.id, plug.id), eq(plugs.siteId, plug.siteId)));
    const after = await getPlugPlan({ ...plug, ...outsideFromPlan(plan) }, tx, now);
    await recordAudit(tx, {
      siteId: plug.siteId,
      userId,
      action: "schedule.update",
      entityType: "plug",
      entityId: plug.id,
      before: planInWords(before.plan),
      after: planInWords(after.plan),
    });
  });
  return getPlugPlan({ ...plug, ...outsideFromPlan(plan) });
}

/** Every working plug of the site, by house, with its plan: the schedules index. */
export async function getSchedulesBySite({ siteId }: { siteId: string }) {
  const db = getDb();
  const rows = await db
    .select(plugColumns)
    .from(plugs)
    .innerJoin(houses, eq(houses.id, plugs.houseId))
    .where(and(eq(plugs.siteId, siteId), isNull(plugs.retiredAt)))
    .orderBy(asc(houses.name), asc(plugs.name));
  const { schedules: byPlug } = await readSchedules(db, rows.map((r) => r.id), new Date());
  return rows.map((plug) => ({ plug, ...planFromSchedules(byPlug.get(plug.id) ?? [], plug) }));
}
