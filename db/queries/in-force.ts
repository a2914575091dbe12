import "server-only";
import { eq, inArray } from "drizzle-orm";
import type { Database } from "@/db/client";
import { loadPlugSchedules } from "@/db/plug-schedules";
import { overrides, schedules, user } from "@/db/schema";
import type { OutsideWindowMode } from "@/lib/domain";
import { inForceAt, type PlanRule } from "@/lib/control/plan";
import type { RuleView } from "@/lib/control/plan-words";

/** What a plug follows now, when that changes and what follows (lib/control/plan.ts), ready to be put in words. */
export type PlugInForce = { rule: RuleView; until: Date | null; next: RuleView | null };

export type PlanPlug = { id: string; outsideWindows: OutsideWindowMode; frostLowC: number | null; frostHighC: number | null };

/**
 * The rule in force for each plug at `now`, read the way the controller reads its
 * schedules and overrides (db/plug-schedules.ts), with the names a person needs: the
 * schedule a window belongs to, who set an override and why.
 */
export async function getInForceByPlug({
  db,
  plugs,
  timeZone,
  now,
}: {
  db: Database;
  plugs: PlanPlug[];
  timeZone: string;
  now: Date;
}): Promise<Map<string, PlugInForce>> {
  if (plugs.length === 0) return new Map();
  const loaded = await loadPlugSchedules(
    db,
    plugs.map((p) => p.id),
    now,
  );
  const plans = plugs.flatMap((plug) => {
    const input = {
      schedules: loaded.schedules.filter((s) => s.plugId === plug.id),
      timeZone,
      outsideWindows: plug.outsideWindows,
      frostLowC: plug.frostLowC,
      frostHighC: plug.frostHighC,
      overrides: loaded.overrides.filter((o) => o.plugId === plug.id),
    };
    try {
      return [{ plugId: plug.id, plan: inForceAt(input, now) }];
    } catch (error) {
      // A stored window the schedule code refuses (lib/schedule throws RangeError) must
      // not take the whole overview down: that plug's line is left out, not guessed.
      if (error instanceof RangeError) return [];
      throw error;
    }
  });

  const rules = plans.flatMap(({ plan }) => (plan.next ? [plan.rule, plan.next] : [plan.rule]));
  const scheduleIds = [...new Set(rules.flatMap((r) => (r.kind === "window" ? [r.scheduleId] : [])))];
  const overrideIds = [...new Set(rules.flatMap((r) => (r.kind === "override" ? [r.overrideId] : [])))];
  const [scheduleRows, overrideRows] = await Promise.all([
    scheduleIds.length
      ? db.select({ id: schedules.id, name: schedules.name }).from(schedules).where(inArray(schedules.id, scheduleIds))
      : [],
    overrideIds.length
      ? db
          .select({ id: overrides.id, reason: overrides.reason, by: user.name })
          .from(overrides)
          .leftJoin(user, eq(user.id, overrides.userId))
          .where(inArray(overrides.id, overrideIds))
      : [],
  ]);
  const scheduleNames = new Map(scheduleRows.map((s) => [s.id, s.name]));
  const overrideNotes = new Map(overrideRows.map((o) => [o.id, o]));

  const view = (rule: PlanRule): RuleView => {
    switch (rule.kind) {
      case "override": {
        const note = overrideNotes.get(rule.overrideId);
        return { kind: "override", on: rule.on, by: note?.by ?? null, reason: note?.reason || null };
      }
      case "window": {
        const scheduleName = scheduleNames.get(rule.scheduleId) ?? null;
        return rule.mode === "band"
          ? { kind: "window", mode: "band", lowC: rule.lowC, highC: rule.highC, scheduleName }
          : { kind: "window", mode: rule.mode, scheduleName };
      }
      default:
        return rule;
    }
  };

  return new Map(plans.map(({ plugId, plan }) => [plugId, { rule: view(plan.rule), until: plan.until, next: plan.next ? view(plan.next) : null }]));
}
