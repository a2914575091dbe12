// Alerts the controller raises and clears: one open row per (kind, plug or sensor).
import { and, eq, isNull, sql } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { alerts } from "@/db/schema";
import type { AlertDetail } from "@/lib/alerts/detail";
import { logDetail } from "@/lib/database-errors";

export type AlertKind = (typeof alerts.$inferInsert)["kind"];
export type AlertSubject = { siteId: string; houseId?: string | null; plugId?: string | null; sensorId?: string | null };

export function alertKey(kind: AlertKind, subject: AlertSubject) {
  return `${kind}:${subject.plugId ?? subject.sensorId ?? subject.houseId ?? subject.siteId}`;
}

export function createAlerts(options: { db: Database; logger: Logger; now: () => number }) {
  const { db, logger } = options;
  // The row id of each open alert, or its insert while that is on its way.
  const open = new Map<string, number | Promise<number | null>>();
  // Moves whenever the open set changes other than by raise/clear (a load, a failed
  // write), so callers that skip unchanged decisions know to look again.
  let generation = 0;

  async function load() {
    const rows = await db
      .select({ id: alerts.id, kind: alerts.kind, siteId: alerts.siteId, plugId: alerts.plugId, sensorId: alerts.sensorId, houseId: alerts.houseId })
      .from(alerts)
      .where(isNull(alerts.clearedAt));
    open.clear();
    generation++;
    for (const row of rows) open.set(alertKey(row.kind, row), row.id);
  }

  function raise(kind: AlertKind, subject: AlertSubject, message: string, detail?: unknown) {
    const key = alertKey(kind, subject);
    if (open.has(key)) return;
    logger.warn({ kind, ...subject, message }, "alert raised");
    const insert: Promise<number | null> = db
      .insert(alerts)
      .values({ kind, ...subject, message: message.slice(0, 280), detail: detail ?? null, raisedAt: new Date(options.now()) })
      .$returningId()
      .then(([row]) => row?.id ?? null)
      .catch((error: unknown) => {
        if (open.get(key) === insert) {
          open.delete(key);
          generation++;
        }
        logger.error({ ...logDetail(error), key }, "could not store an alert; it will be raised again");
        return null;
      });
    open.set(key, insert);
    void insert.then((id) => {
      if (id !== null && open.get(key) === insert) open.set(key, id);
    });
  }

  /**
   * Closes the open alert of this kind and subject, if any. `clearedMessage` is the
   * figure-free "back to normal" sentence; `cleared` is kept as the row's detail.cleared
   * (its `at` defaults to now). A clear that follows its raise closely waits for the
   * row to be written.
   */
  function clear(kind: AlertKind, subject: AlertSubject, clearedMessage?: string, cleared?: Partial<NonNullable<AlertDetail["cleared"]>>) {
    const key = alertKey(kind, subject);
    const id = open.get(key);
    if (id === undefined) return;
    open.delete(key);
    logger.info({ kind, ...subject, clearedMessage }, "alert cleared");
    const clearedAt = new Date(options.now());
    const clearedDetail = cleared || clearedMessage ? { ...cleared, at: cleared?.at ?? clearedAt.toISOString() } : null;
    const set = {
      clearedAt,
      ...(clearedMessage ? { clearedMessage: clearedMessage.slice(0, 280) } : {}),
      ...(clearedDetail ? { detail: sql`JSON_SET(COALESCE(${alerts.detail}, JSON_OBJECT()), '$.cleared', JSON_EXTRACT(${JSON.stringify(clearedDetail)}, '$'))` } : {}),
    };
    Promise.resolve(id)
      .then((rowId) => (rowId === null ? undefined : db.update(alerts).set(set).where(and(eq(alerts.id, rowId), isNull(alerts.clearedAt)))))
      .catch((error: unknown) => logger.error({ ...logDetail(error), key }, "could not clear an alert"));
  }

  return { load, raise, clear, generation: () => generation, isOpen: (kind: AlertKind, subject: AlertSubject) => open.has(alertKey(kind, subject)) };
}

export type Alerts = ReturnType<typeof createAlerts>;
