import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, gt, inArray, isNull, or } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { getDb, type Database } from "@/db/client";
import { loadPlugStates } from "@/db/plug-states";
import { houses, overrides, plugs, switchEvents, user } from "@/db/schema";
import type { SwitchCause } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { overrideEnd, overrideStopsAt } from "@/lib/override-end";
import { overrideEndsAt } from "@/lib/control/plan";
import { loadSchedulesOfPlugs } from "@/db/plug-schedules";
import { nextChange, type Schedule } from "@/lib/schedule";
import type { OverrideInput } from "@/lib/schemas/override";
import { transactionOrConflict } from "@/db/transaction";

const BUSY_PLUG = "Other changes to this plug were being saved at the same moment and this one could not get through; nothing was changed. Please try again.";
import { recordAudit } from "./audit";

export type OverridePlug = {
  id: string;
  siteId: string;
  deviceId: string;
  name: string;
  houseId: string;
  houseName: string;
  applianceKind: string;
  minOnS: number;
  minOffS: number;
  retiredAt: Date | null;
};

/** A plug of the site (retired ones too, for their history); 404 when it is not there. */
export async function requirePlugOfSite({ siteId, plugId }: { siteId: string; plugId: string }): Promise<OverridePlug> {
  const [row] = await getDb()
    .select({
      id: plugs.id,
      siteId: plugs.siteId,
      deviceId: plugs.deviceId,
      name: plugs.name,
      houseId: plugs.houseId,
      houseName: houses.name,
      applianceKind: plugs.applianceKind,
      minOnS: plugs.minOnS,
      minOffS: plugs.minOffS,
      retiredAt: plugs.retiredAt,
    })
    .from(plugs)
    .innerJoin(houses, eq(houses.id, plugs.houseId))
    .where(and(eq(plugs.siteId, siteId), eq(plugs.id, plugId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such plug in this site.");
  return row;
}

/** The plug's schedules in the shape lib/schedule resolves, as the controller loads them (controller/config.ts). */
/** A plug's schedules, as the controller reads them. */
export async function getSchedulesOfPlug(db: Pick<Database, "select">, plugId: string): Promise<Schedule[]> {
  return loadSchedulesOfPlugs(db, [plugId]);
}

type StoredOverride = typeof overrides.$inferSelect;

/** When a stored override stops acting, as the controller judges it. */
function stopsAt(o: StoredOverride, plugSchedules: Schedule[], timeZone: string): Date | null {
  return overrideStopsAt(o, overrideEndsAt(o, plugSchedules, timeZone));
}

const isActive = (o: StoredOverride, stops: Date | null, now: Date) =>
  o.cancelledAt === null && o.startsAt <= now && (stops === null || stops > now);

/** What the audit log keeps of an override. */
/** An override as the activity page shows it, named by its plug. */
const auditView = (o: StoredOverride, plugName: string) => ({
  name: plugName,
  on: o.on,
  startsAt: o.startsAt,
  endsAt: o.endsAt,
  untilNextChange: o.untilNextChange,
  reason: o.reason,
  ...(o.cancelledAt ? { cancelledAt: o.cancelledAt } : {}),
});

export type OverrideView = {
  id: string;
  on: boolean;
  startsAt: Date;
  endsAt: Date | null;
  untilNextChange: boolean;
  /** When it stops (or stopped) acting: its end, the schedule's next change, or its cancellation; null: until cancelled. */
  stopsAt: Date | null;
  reason: string;
  byName: string | null;
  cancelledAt: Date | null;
  cancelledByName: string | null;
  active: boolean;
};

export type PlugNow = {
  online: boolean;
  lastSeenAt: Date | null;
  /** The state its last kept switch took it to; null before the first. */
  on: boolean | null;
  since: Date | null;
  /** Why it was last switched. */
  cause: SwitchCause | null;
  /** Why the controller keeps it as it is now. */
  presentCause: SwitchCause | null;
  /** A switch on its way, not yet confirmed by the plug. */
  pendingOn: boolean | null;
  pendingSince: Date | null;
  /** The anti-short-cycle guard lets the wanted change through at this instant. */
  guardUntil: Date | null;
  /** The plug's own last report (its time by the plug's clock). */
  reportedOn: boolean | null;
  reportedAt: Date | null;
};

export type OverridePanel = {
  at: Date;
  plug: Omit<OverridePlug, "siteId">;
  now: PlugNow;
  /** The schedule's next change from now, for "until the schedule changes". */
  nextChangeAt: Date | null;
  active: OverrideView | null;
  recent: OverrideView[];
};

const RECENT = 20;

/** Everything the override page shows of one plug: its state now, the override in force and the recent ones. */
export async function getOverridePanel({ plug, timeZone, now = new Date() }: { plug: OverridePlug; timeZone: string; now?: Date }): Promise<OverridePanel> {
  const db = getDb();
  const by = alias(user, "by_user");
  const cancelledBy = alias(user, "cancelled_by_user");
  const [rows, plugSchedules, states] = await Promise.all([
    db
      .select({ o: overrides, byName: by.name, cancelledByName: cancelledBy.name })
      .from(overrides)
      .leftJoin(by, eq(by.id, overrides.userId))
      .leftJoin(cancelledBy, eq(cancelledBy.id, overrides.cancelledBy))
      .where(eq(overrides.plugId, plug.id))
      .orderBy(desc(overrides.startsAt))
      .limit(RECENT),
    getSchedulesOfPlug(db, plug.id),
    loadPlugStates(db, [plug.id]),
  ]);
  const st = states.get(plug.id);
  const commandIds = [st?.switchCommandId].filter((id): id is string => !!id);
  const [last] = commandIds.length
    ? await db.select({ cause: switchEvents.cause }).from(switchEvents).where(inArray(switchEvents.commandId, commandIds))
    : [];
  const recent = rows.map(({ o, byName, cancelledByName }): OverrideView => {
    const stops = stopsAt(o, plugSchedules, timeZone);
    return {
      id: o.id,
      on: o.on,
      startsAt: o.startsAt,
      endsAt: o.endsAt,
      untilNextChange: o.untilNextChange,
      stopsAt: stops,
      reason: o.reason,
      byName,
      cancelledAt: o.cancelledAt,
      cancelledByName,
      active: isActive(o, stops, now),
    };
  });
  const { siteId: _siteId, ...plugView } = plug;
  return {
    at: now,
    plug: plugView,
    now: {
      online: st?.online ?? false,
      lastSeenAt: st?.lastSeenAt ?? null,
      on: st?.on ?? null,
      since: st?.since ?? null,
      cause: last?.cause ?? null,
      presentCause: st?.presentCause ?? null,
      pendingOn: st?.pendingCommandId ? st.pendingOn : null,
      pendingSince: st?.pendingCommandId ? st.pendingSince : null,
      guardUntil: st?.guardUntil ?? null,
      reportedOn: st?.reportedOn ?? null,
      reportedAt: st?.reportedAt ?? null,
    },
    nextChangeAt: nextChange(plugSchedules, timeZone, now),
    active: recent.find((o) => o.active) ?? null,
    recent,
  };
}

/** The plug's overrides that may still act (not cancelled, not past a fixed end), locked for the change. */
async function openOverrides(tx: Database, plugId: string, now: Date) {
  return tx
    .select()
    .from(overrides)
    .where(and(eq(overrides.plugId, plugId), isNull(overrides.cancelledAt), or(isNull(overrides.endsAt), gt(overrides.endsAt, now))))
    .for("update");
}

async function cancelRow(tx: Database, o: StoredOverride, plug: Pick<OverridePlug, "siteId" | "name">, userId: string, now: Date) {
  await tx.update(overrides).set({ cancelledAt: now, cancelledBy: userId }).where(eq(overrides.id, o.id));
  await recordAudit(tx, {
    siteId: plug.siteId,
    userId,
    action: "override.cancel",
    entityType: "override",
    entityId: o.id,
    before: auditView(o, plug.name),
    after: auditView({ ...o, cancelledAt: now, cancelledBy: userId }, plug.name),
  });
}

/**
 * Overrides a plug from now: ends the plug's override in force (if any) and starts the
 * new one, in one transaction, both in the audit log. Bad end times are a 400; a
 * retired plug a 409.
 */
export async function createOverride({
  plug,
  timeZone,
  userId,
  input,
  now,
}: {
  plug: OverridePlug;
  timeZone: string;
  userId: string;
  input: OverrideInput;
  /** The press's instant; by default the moment the plug's lock is held, so the press that commits last starts last. */
  now?: Date;
}): Promise<{ id: string; startsAt: Date; endsAt: Date | null; untilNextChange: boolean; stopsAt: Date | null; cancelled: string[] }> {
  if (plug.retiredAt) throw new AppError("conflict", "This plug is retired: it is no longer switched, so it cannot be overridden.");
  const db = getDb();
  // The schedule matters only for "until the schedule changes" (this one or one in force):
  // a phone's press should not wait for it otherwise.
  let plugSchedules = input.duration === "next_change" ? await getSchedulesOfPlug(db, plug.id) : null;
  const cancelled: string[] = [];
  const made = await transactionOrConflict(db, async (tx) => {
    cancelled.length = 0;
    // One change at a time per plug: two presses at once must not leave two overrides in force.
    await tx.select({ id: plugs.id }).from(plugs).where(eq(plugs.id, plug.id)).for("update");
    // Taken under the lock: a press that waited for it must not start before the one it replaces.
    const at = now ?? new Date();
    const next = plugSchedules ? nextChange(plugSchedules, timeZone, at) : null;
    const end = overrideEnd(input, at, timeZone, next);
    const row: StoredOverride = {
      id: randomUUID(),
      plugId: plug.id,
      on: input.on,
      startsAt: at,
      endsAt: end.endsAt,
      untilNextChange: end.untilNextChange,
      userId,
      reason: input.reason ?? "",
      cancelledAt: null,
      cancelledBy: null,
      createdAt: at,
    };
    for (const o of await openOverrides(tx, plug.id, at)) {
      if (o.untilNextChange && !o.endsAt) plugSchedules ??= await getSchedulesOfPlug(tx, plug.id);
      if (!isActive(o, stopsAt(o, plugSchedules ?? [], timeZone), at)) continue;
      await cancelRow(tx, o, plug, userId, at);
      cancelled.push(o.id);
    }
    await tx.insert(overrides).values(row);
    await recordAudit(tx, { siteId: plug.siteId, userId, action: "override.create", entityType: "override", entityId: row.id, after: auditView(row, plug.name) });
    return { row, end, next };
  }, BUSY_PLUG);
  const { row, end, next } = made;
  return { id: row.id, startsAt: row.startsAt, endsAt: end.endsAt, untilNextChange: end.untilNextChange, stopsAt: end.endsAt ?? next, cancelled };
}

/** Cancels one of the plug's overrides; 404 when it is not the plug's, 409 when it has already stopped. */
export async function cancelOverride({
  plug,
  timeZone,
  overrideId,
  userId,
  now = new Date(),
}: {
  plug: OverridePlug;
  timeZone: string;
  overrideId: string;
  userId: string;
  now?: Date;
}): Promise<{ id: string; cancelledAt: Date }> {
  const db = getDb();
  const plugSchedules = await getSchedulesOfPlug(db, plug.id);
  await transactionOrConflict(db, async (tx) => {
    const [o] = await tx
      .select()
      .from(overrides)
      .where(and(eq(overrides.id, overrideId), eq(overrides.plugId, plug.id)))
      .for("update");
    if (!o) throw new AppError("not_found", "No such override for this plug.");
    if (o.cancelledAt) throw new AppError("conflict", "This override has already been cancelled.");
    if (!isActive(o, stopsAt(o, plugSchedules, timeZone), now)) throw new AppError("conflict", "This override has already ended.");
    await cancelRow(tx, o, plug, userId, now);
  }, BUSY_PLUG);
  return { id: overrideId, cancelledAt: now };
}
