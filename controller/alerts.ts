// Alerts the controller raises and clears: one open row per (kind, plug or sensor).
import { and, eq, isNull } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { alerts } from "@/db/schema";

export type AlertKind = (typeof alerts.$inferInsert)["kind"];
export type AlertSubject = { siteId: string; houseId?: string | null; plugId?: string | null; sensorId?: string | null };

export function alertKey(kind: AlertKind, subject: AlertSubject) {
  return `${kind}:${subject.plugId ?? subject.sensorId ?? subject.houseId ?? subject.siteId}`;
}

export function createAlerts(options: { db: Database; logger: Logger; now: () => number }) {
  const { db, logger } = options;
  const open = new Map<string, number | "pending">();
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
    open.set(key, "pending");
    logger.warn({ kind, ...subject, message }, "alert raised");
    db.insert(alerts)
      .values({ kind, ...subject, message: message.slice(0, 280), detail: detail ?? null, raisedAt: new Date(options.now()) })
      .$returningId()
      .then(([row]) => {
        if (open.get(key) === "pending" && row) open.set(key, row.id);
      })
      .catch((error: unknown) => {
        open.delete(key);
        generation++;
        logger.error({ err: error, key }, "could not store an alert; it will be raised again");
      });
  }

  function clear(kind: AlertKind, subject: AlertSubject) {
    const key = alertKey(kind, subject);
    const id = open.get(key);
    if (id === undefined) return;
    open.delete(key);
    logger.info({ kind, ...subject }, "alert cleared");
    const where =
      typeof id === "number"
        ? eq(alerts.id, id)
        : and(eq(alerts.kind, kind), isNull(alerts.clearedAt), subject.plugId ? eq(alerts.plugId, subject.plugId) : eq(alerts.sensorId, subject.sensorId ?? ""));
    db.update(alerts)
      .set({ clearedAt: new Date(options.now()) })
      .where(where)
      .catch((error: unknown) => logger.error({ err: error, key }, "could not clear an alert"));
  }

  return { load, raise, clear, generation: () => generation, isOpen: (kind: AlertKind, subject: AlertSubject) => open.has(alertKey(kind, subject)) };
}

export type Alerts = ReturnType<typeof createAlerts>;
