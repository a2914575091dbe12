import "server-only";
// The notifier's reads and writes: which alerts still need telling, the outbox rows it
// writes with their bookkeeping in alert_notices (one transaction), and the claims and
// outcomes of sending. Only the notifier (lib/server/alerts/) uses this module.
import { and, asc, eq, gte, inArray, isNotNull, isNull, lte, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { alertNotices, alerts, houseAlertRules, houses, outboundMail, sites, userSettings } from "@/db/schema";
import { alertDetailFrom, type AlertDetail } from "@/lib/alerts/detail";
import { DEFAULT_ALERT_RULES, storedAlertRules } from "@/lib/alerts/rules";
import type { AlertKind, MailPurpose, MailStatus, TemperatureUnit } from "@/lib/domain";

export type NotifierSite = { id: string; slug: string; name: string; zone: string; currency: string; summaryTime: string | null };

/** The sites the notifier looks after: all, or the ones given (tests keep to their own). */
export async function getNotifierSites({ siteIds }: { siteIds?: readonly string[] } = {}): Promise<NotifierSite[]> {
  if (siteIds && siteIds.length === 0) return [];
  return getDb()
    .select({ id: sites.id, slug: sites.slug, name: sites.name, zone: sites.timeZone, currency: sites.currency, summaryTime: sites.summaryTime })
    .from(sites)
    .where(siteIds ? inArray(sites.id, [...siteIds]) : undefined)
    .orderBy(asc(sites.slug));
}

/** The open "control stopped" alert of a site, if any. */
export async function getOpenControllerSilentAlert({ siteId }: { siteId: string }): Promise<{ id: number; raisedAt: Date } | null> {
  const [row] = await getDb()
    .select({ id: alerts.id, raisedAt: alerts.raisedAt })
    .from(alerts)
    .where(and(eq(alerts.siteId, siteId), eq(alerts.kind, "controller_silent"), isNull(alerts.clearedAt)))
    .orderBy(asc(alerts.raisedAt))
    .limit(1);
  return row ?? null;
}

export async function raiseControllerSilentAlert({ siteId, message, detail, at }: { siteId: string; message: string; detail: AlertDetail; at: Date }): Promise<void> {
  await getDb().insert(alerts).values({ siteId, houseId: null, kind: "controller_silent", message, detail, raisedAt: at });
}

export async function clearControllerSilentAlert({ siteId, alertId, clearedMessage, at }: { siteId: string; alertId: number; clearedMessage: string; at: Date }): Promise<void> {
  await getDb()
    .update(alerts)
    .set({ clearedAt: at, clearedMessage })
    .where(and(eq(alerts.id, alertId), eq(alerts.siteId, siteId), isNull(alerts.clearedAt)));
}

export type AlertToTell = {
  id: number;
  kind: AlertKind;
  message: string;
  detail: AlertDetail;
  raisedAt: Date;
  clearedAt: Date | null;
  clearedMessage: string | null;
  acknowledgedAt: Date | null;
  houseName: string | null;
  /** The house's reminder interval (the defaults' for a site-level alert). */
  reminderMin: number;
  notice: { raisedAt: Date | null; reminders: number; lastReminderAt: Date | null; clearedAt: Date | null } | null;
};

/**
 * The site's alerts the notifier still has something to do for: not yet announced, open
 * and unacknowledged (reminders), or cleared without their back-to-normal announced.
 */
export async function getAlertsToTell({ siteId, now }: { siteId: string; now: Date }): Promise<AlertToTell[]> {
  // Alerts that cleared over a week ago are history: whatever was not told by then is not news.
  const recent = new Date(now.getTime() - 7 * 24 * 3600_000);
  const rows = await getDb()
    .select({
      id: alerts.id,
      kind: alerts.kind,
      message: alerts.message,
      detail: alerts.detail,
      raisedAt: alerts.raisedAt,
      clearedAt: alerts.clearedAt,
      clearedMessage: alerts.clearedMessage,
      acknowledgedAt: alerts.acknowledgedAt,
      houseName: houses.name,
      rules: houseAlertRules.rules,
      noticeAlertId: alertNotices.alertId,
      noticeRaisedAt: alertNotices.raisedAt,
      reminders: alertNotices.reminders,
      lastReminderAt: alertNotices.lastReminderAt,
      noticeClearedAt: alertNotices.clearedAt,
    })
    .from(alerts)
    .leftJoin(houses, and(eq(houses.id, alerts.houseId), eq(houses.siteId, alerts.siteId)))
    .leftJoin(houseAlertRules, eq(houseAlertRules.houseId, alerts.houseId))
    .leftJoin(alertNotices, eq(alertNotices.alertId, alerts.id))
    .where(
      and(
        eq(alerts.siteId, siteId),
        or(isNull(alerts.clearedAt), gte(alerts.clearedAt, recent)),
        or(
          isNull(alertNotices.alertId),
          and(isNull(alerts.clearedAt), isNull(alerts.acknowledgedAt)),
          and(isNotNull(alerts.clearedAt), isNotNull(alertNotices.raisedAt), isNull(alertNotices.clearedAt)),
        ),
      ),
    )
    .orderBy(asc(alerts.raisedAt), asc(alerts.id));
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    message: r.message,
    detail: alertDetailFrom(r.detail),
    raisedAt: r.raisedAt,
    clearedAt: r.clearedAt,
    clearedMessage: r.clearedMessage,
    acknowledgedAt: r.acknowledgedAt,
    houseName: r.houseName ?? alertDetailFrom(r.detail).houseName ?? null,
    reminderMin: r.rules === null ? DEFAULT_ALERT_RULES.reminderMin : storedAlertRules(r.rules).reminderMin,
    notice:
      r.noticeAlertId === null
        ? null
        : { raisedAt: r.noticeRaisedAt, reminders: r.reminders ?? 0, lastReminderAt: r.lastReminderAt, clearedAt: r.noticeClearedAt },
  }));
}

/** Who was written an opening e-mail for an alert, and where that e-mail stands. */
export async function getRaisedMailOfAlert({ alertId }: { alertId: number }): Promise<{ userId: string | null; toAddress: string; status: MailStatus; dueAt: Date }[]> {
  return getDb()
    .select({ userId: outboundMail.userId, toAddress: outboundMail.toAddress, status: outboundMail.status, dueAt: outboundMail.dueAt })
    .from(outboundMail)
    .where(and(eq(outboundMail.alertId, alertId), eq(outboundMail.purpose, "alert_raised")));
}

/** Each person's temperature unit (°C for those who never chose). */
export async function getTemperatureUnitsByUser({ userIds }: { userIds: readonly string[] }): Promise<Map<string, TemperatureUnit>> {
  const units = new Map<string, TemperatureUnit>(userIds.map((id) => [id, "c"]));
  if (userIds.length === 0) return units;
  const rows = await getDb()
    .select({ userId: userSettings.userId, unit: userSettings.temperatureUnit })
    .from(userSettings)
    .where(inArray(userSettings.userId, [...userIds]));
  for (const row of rows) units.set(row.userId, row.unit);
  return units;
}

export type OutboxRow = {
  siteId: string;
  userId: string;
  toAddress: string;
  purpose: MailPurpose;
  alertId: number | null;
  summaryDay?: string | null;
  dedupeKey: string;
  subject: string;
  bodyText: string;
  bodyHtml: string;
  status: "waiting" | "held";
  dueAt: Date;
};

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/** Writes outbox rows; one already written under the same dedupe key is left as it is. */
export async function insertOutboxRows(tx: Tx | ReturnType<typeof getDb>, rows: OutboxRow[], now: Date): Promise<void> {
  if (rows.length === 0) return;
  await tx
    .insert(outboundMail)
    .values(
      rows.map((r) => ({
        siteId: r.siteId,
        userId: r.userId,
        toAddress: r.toAddress,
        purpose: r.purpose,
        alertId: r.alertId,
        summaryDay: r.summaryDay ?? null,
        dedupeKey: r.dedupeKey,
        subject: r.subject,
        bodyText: r.bodyText,
        bodyHtml: r.bodyHtml,
        status: r.status,
        dueAt: r.dueAt,
        createdAt: now,
      })),
    )
    .onDuplicateKeyUpdate({ set: { dedupeKey: sql`${outboundMail.dedupeKey}` } });
}

export type NoticeChange =
  | { step: "raised"; at: Date }
  | { step: "reminder"; number: number; at: Date }
  | { step: "cleared"; at: Date };

/** The outbox rows for one step of one alert and its bookkeeping, in one transaction. */
export async function recordAlertNotice({ alertId, change, rows, now }: { alertId: number; change: NoticeChange; rows: OutboxRow[]; now: Date }): Promise<void> {
  await getDb().transaction(async (tx) => {
    await insertOutboxRows(tx, rows, now);
    if (change.step === "raised") {
      await tx
        .insert(alertNotices)
        .values({ alertId, raisedAt: change.at })
        .onDuplicateKeyUpdate({ set: { raisedAt: sql`COALESCE(${alertNotices.raisedAt}, VALUES(${alertNotices.raisedAt}))` } });
    } else if (change.step === "reminder") {
      await tx.update(alertNotices).set({ reminders: change.number, lastReminderAt: change.at }).where(eq(alertNotices.alertId, alertId));
    } else {
      await tx
        .insert(alertNotices)
        .values({ alertId, raisedAt: null, clearedAt: change.at })
        .onDuplicateKeyUpdate({ set: { clearedAt: change.at } });
    }
  });
}

/** An alert that came and went before anyone was told: noted as done, with nothing sent. */
export async function recordAlertPassedUntold({ alertId, at }: { alertId: number; at: Date }): Promise<void> {
  await getDb().insert(alertNotices).values({ alertId, raisedAt: null, clearedAt: at }).onDuplicateKeyUpdate({ set: { clearedAt: at } });
}

export type DueMail = {
  id: number;
  toAddress: string;
  subject: string;
  bodyText: string;
  bodyHtml: string | null;
  status: MailStatus;
  purpose: MailPurpose;
  attempts: number;
  createdAt: Date;
  alertClearedAt: Date | null;
  /** A back-to-normal whose opening e-mail to the same person has not gone yet waits for it. */
  waitsForOpening: boolean;
};

/** Waiting or held e-mails due by `now`, oldest first (of the given sites only, when given). */
export async function getDueMail({ now, siteIds, limit = 50 }: { now: Date; siteIds?: readonly string[]; limit?: number }): Promise<DueMail[]> {
  if (siteIds && siteIds.length === 0) return [];
  const rows = await getDb()
    .select({
      id: outboundMail.id,
      toAddress: outboundMail.toAddress,
      subject: outboundMail.subject,
      bodyText: outboundMail.bodyText,
      bodyHtml: outboundMail.bodyHtml,
      status: outboundMail.status,
      purpose: outboundMail.purpose,
      attempts: outboundMail.attempts,
      createdAt: outboundMail.createdAt,
      alertClearedAt: alerts.clearedAt,
      waitsForOpening: sql<number>`(${outboundMail.purpose} = 'alert_cleared' AND EXISTS (
        SELECT 1 FROM outbound_mail AS opening
        WHERE opening.alert_id = ${outboundMail.alertId} AND opening.user_id = ${outboundMail.userId}
          AND opening.purpose = 'alert_raised' AND opening.status = 'waiting'))`.mapWith(Number),
    })
    .from(outboundMail)
    .leftJoin(alerts, eq(alerts.id, outboundMail.alertId))
    .where(and(inArray(outboundMail.status, ["waiting", "held"]), lte(outboundMail.dueAt, now), siteIds ? inArray(outboundMail.siteId, [...siteIds]) : undefined))
    .orderBy(asc(outboundMail.dueAt), asc(outboundMail.id))
    .limit(limit);
  return rows.map((r) => ({ ...r, waitsForOpening: r.waitsForOpening === 1 }));
}

/**
 * Takes a due e-mail for sending: moves it out of reach (due again only after `leaseUntil`,
 * should this process die mid-send) and reports whether this caller got it.
 */
export async function claimMail({ id, now, leaseUntil }: { id: number; now: Date; leaseUntil: Date }): Promise<boolean> {
  const [result] = await getDb()
    .update(outboundMail)
    .set({ status: "waiting", dueAt: leaseUntil, lastTriedAt: now })
    .where(and(eq(outboundMail.id, id), inArray(outboundMail.status, ["waiting", "held"]), lte(outboundMail.dueAt, now)));
  return result.affectedRows === 1;
}

export async function markMailSent({ id, at }: { id: number; at: Date }): Promise<void> {
  await getDb()
    .update(outboundMail)
    .set({ status: "sent", sentAt: at, lastError: null, attempts: sql`${outboundMail.attempts} + 1` })
    .where(eq(outboundMail.id, id));
}

export async function markMailFailed({ id, error, retryAt }: { id: number; error: string; retryAt: Date | null }): Promise<void> {
  await getDb()
    .update(outboundMail)
    .set(
      retryAt
        ? { attempts: sql`${outboundMail.attempts} + 1`, lastError: error.slice(0, 500), dueAt: retryAt }
        : { attempts: sql`${outboundMail.attempts} + 1`, lastError: error.slice(0, 500), status: "given_up" },
    )
    .where(eq(outboundMail.id, id));
}

/** A held e-mail that is no longer worth sending, with the reason in plain words. */
export async function markMailSkipped({ id, reason }: { id: number; reason: string }): Promise<boolean> {
  const [result] = await getDb()
    .update(outboundMail)
    .set({ status: "skipped", lastError: reason.slice(0, 500) })
    .where(and(eq(outboundMail.id, id), inArray(outboundMail.status, ["waiting", "held"])));
  return result.affectedRows === 1;
}
