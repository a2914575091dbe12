import "server-only";
import { and, asc, desc, eq, inArray, isNotNull, isNull, lt, or, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { getDb } from "@/db/client";
import { alerts, houses, outboundMail, plugs, sensors, user } from "@/db/schema";
import { alertDetailFrom, type AlertDetail } from "@/lib/alerts/detail";
import { ALERT_KIND_LABELS, type AlertKind, type MailPurpose, type MailStatus } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { decodeAlertCursor, encodeAlertCursor, type AlertListStatus } from "@/lib/schemas/alert-list";
import { recordAudit } from "./audit";

/** One e-mail the notifier wrote for an alert, as the list shows it. */
export type AlertDelivery = {
  id: number;
  purpose: MailPurpose;
  to: string;
  /** The member's name when the address is still a member's. */
  name: string | null;
  status: MailStatus;
  attempts: number;
  lastError: string | null;
  dueAt: string;
  sentAt: string | null;
};

export type AlertItem = {
  id: number;
  kind: AlertKind;
  message: string;
  detail: AlertDetail;
  house: { id: string; name: string } | null;
  sensor: { id: string; name: string } | null;
  plug: { id: string; name: string } | null;
  raisedAt: string;
  clearedAt: string | null;
  clearedMessage: string | null;
  acknowledgedAt: string | null;
  acknowledgedBy: string | null;
  deliveries: AlertDelivery[];
};

export type AlertPage = { alerts: AlertItem[]; nextCursor: string | null };

const acknowledger = alias(user, "acknowledger");
const recipient = alias(user, "recipient");

const iso = (at: Date | null) => (at ? at.toISOString() : null);

/**
 * A page of the site's alerts, newest raised first: open ones (not cleared) or past ones,
 * with the e-mails written for each. Keyset on (raised_at, id), so a deep page costs what
 * the first does (alerts_site_raised_idx).
 */
export async function getAlertPage({
  siteId,
  status,
  houseId,
  kind,
  cursor,
  limit,
}: {
  siteId: string;
  status: AlertListStatus;
  houseId?: string;
  kind?: AlertKind;
  cursor?: string;
  limit: number;
}): Promise<AlertPage> {
  const db = getDb();
  const where: SQL[] = [eq(alerts.siteId, siteId), status === "open" ? isNull(alerts.clearedAt) : isNotNull(alerts.clearedAt)];
  if (houseId) where.push(eq(alerts.houseId, houseId));
  if (kind) where.push(eq(alerts.kind, kind));
  const after = cursor ? decodeAlertCursor(cursor) : null;
  if (after) where.push(or(lt(alerts.raisedAt, after.at), and(eq(alerts.raisedAt, after.at), lt(alerts.id, after.id)))!);

  const rows = await db
    .select({
      id: alerts.id,
      kind: alerts.kind,
      message: alerts.message,
      detail: alerts.detail,
      houseId: houses.id,
      houseName: houses.name,
      sensorId: sensors.id,
      sensorName: sensors.name,
      plugId: plugs.id,
      plugName: plugs.name,
      raisedAt: alerts.raisedAt,
      clearedAt: alerts.clearedAt,
      clearedMessage: alerts.clearedMessage,
      acknowledgedAt: alerts.acknowledgedAt,
      acknowledgedBy: acknowledger.name,
    })
    .from(alerts)
    .leftJoin(houses, and(eq(houses.id, alerts.houseId), eq(houses.siteId, siteId)))
    .leftJoin(sensors, and(eq(sensors.id, alerts.sensorId), eq(sensors.siteId, siteId)))
    .leftJoin(plugs, and(eq(plugs.id, alerts.plugId), eq(plugs.siteId, siteId)))
    .leftJoin(acknowledger, eq(acknowledger.id, alerts.acknowledgedBy))
    .where(and(...where))
    .orderBy(desc(alerts.raisedAt), desc(alerts.id))
    .limit(limit + 1);

  const page = rows.slice(0, limit);
  const deliveries = await getAlertDeliveries({ siteId, alertIds: page.map((r) => r.id) });
  const last = page.at(-1);
  return {
    alerts: page.map((r) => {
      const detail = alertDetailFrom(r.detail);
      return {
        id: r.id,
        kind: r.kind,
        message: r.message,
        detail,
        house: r.houseId ? { id: r.houseId, name: r.houseName! } : null,
        sensor: r.sensorId ? { id: r.sensorId, name: r.sensorName! } : null,
        plug: r.plugId ? { id: r.plugId, name: r.plugName! } : null,
        raisedAt: r.raisedAt.toISOString(),
        clearedAt: iso(r.clearedAt),
        clearedMessage: r.clearedMessage,
        acknowledgedAt: iso(r.acknowledgedAt),
        acknowledgedBy: r.acknowledgedAt ? (r.acknowledgedBy ?? "a former member") : null,
        deliveries: deliveries.get(r.id) ?? [],
      };
    }),
    nextCursor: rows.length > limit && last ? encodeAlertCursor({ at: last.raisedAt, id: last.id }) : null,
  };
}

/** The e-mails of these alerts (of this site), oldest first, by alert. */
async function getAlertDeliveries({ siteId, alertIds }: { siteId: string; alertIds: number[] }): Promise<Map<number, AlertDelivery[]>> {
  const byAlert = new Map<number, AlertDelivery[]>();
  if (alertIds.length === 0) return byAlert;
  const rows = await getDb()
    .select({
      id: outboundMail.id,
      alertId: outboundMail.alertId,
      purpose: outboundMail.purpose,
      to: outboundMail.toAddress,
      name: recipient.name,
      status: outboundMail.status,
      attempts: outboundMail.attempts,
      lastError: outboundMail.lastError,
      dueAt: outboundMail.dueAt,
      sentAt: outboundMail.sentAt,
    })
    .from(outboundMail)
    .leftJoin(recipient, eq(recipient.id, outboundMail.userId))
    .where(and(eq(outboundMail.siteId, siteId), inArray(outboundMail.alertId, alertIds)))
    .orderBy(asc(outboundMail.createdAt), asc(outboundMail.id));
  for (const { alertId, dueAt, sentAt, ...row } of rows) {
    const list = byAlert.get(alertId!) ?? [];
    list.push({ ...row, dueAt: dueAt.toISOString(), sentAt: iso(sentAt) });
    byAlert.set(alertId!, list);
  }
  return byAlert;
}

export type AlertRow = { id: number; kind: AlertKind; houseId: string | null; clearedAt: Date | null; acknowledgedAt: Date | null };

/** One alert of the site (the loader of its handlers): another site's is a 404. */
export async function getAlertForSite({ siteId, alertId }: { siteId: string; alertId: number }): Promise<AlertRow> {
  const [row] = await getDb()
    .select({ id: alerts.id, kind: alerts.kind, houseId: alerts.houseId, clearedAt: alerts.clearedAt, acknowledgedAt: alerts.acknowledgedAt })
    .from(alerts)
    .where(and(eq(alerts.id, alertId), eq(alerts.siteId, siteId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such alert in this site.");
  return row;
}

export type Acknowledgement = { alertId: number; acknowledgedAt: string; acknowledgedBy: string | null; already: boolean };

/**
 * Marks an open alert as seen by this person, so reminders stop and others know someone
 * is on it. Pressing again (or a second person) changes nothing and answers with the
 * first acknowledgement. A cleared alert is refused: it is back to normal already.
 */
export async function acknowledgeAlert({ siteId, alertId, userId }: { siteId: string; alertId: number; userId: string }): Promise<Acknowledgement> {
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .select({ kind: alerts.kind, houseName: houses.name, clearedAt: alerts.clearedAt, acknowledgedAt: alerts.acknowledgedAt, acknowledgedBy: user.name })
      .from(alerts)
      .leftJoin(houses, eq(houses.id, alerts.houseId))
      .leftJoin(user, eq(user.id, alerts.acknowledgedBy))
      .where(and(eq(alerts.id, alertId), eq(alerts.siteId, siteId)))
      .for("update");
    if (!row) throw new AppError("not_found", "No such alert in this site.");
    if (row.acknowledgedAt) {
      return { alertId, acknowledgedAt: row.acknowledgedAt.toISOString(), acknowledgedBy: row.acknowledgedBy, already: true };
    }
    if (row.clearedAt) {
      throw new AppError("conflict", "This alert is already back to normal: there is nothing left to acknowledge.");
    }
    const now = new Date();
    const name = row.houseName ? `${ALERT_KIND_LABELS[row.kind]} in ${row.houseName}` : ALERT_KIND_LABELS[row.kind];
    await tx.update(alerts).set({ acknowledgedAt: now, acknowledgedBy: userId }).where(and(eq(alerts.id, alertId), eq(alerts.siteId, siteId)));
    await recordAudit(tx, {
      siteId,
      userId,
      action: "alert.acknowledge",
      entityType: "alert",
      entityId: String(alertId),
      before: { name, acknowledgedAt: null },
      after: { name, acknowledgedAt: now.toISOString() },
    });
    const [me] = await tx.select({ name: user.name }).from(user).where(eq(user.id, userId));
    return { alertId, acknowledgedAt: now.toISOString(), acknowledgedBy: me?.name ?? null, already: false };
  });
}
