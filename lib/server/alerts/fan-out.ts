// From alerts to e-mails in the outbox: the opening one to each member who receives the
// kind, reminders while nobody acknowledges it, and the back-to-normal to everyone who
// was written the opening one. Quiet hours (each member's, in the site's zone) hold a
// non-frost opening e-mail until they end and drop a reminder that falls in them; frost
// risk is never held. Each step's rows and its bookkeeping go in one transaction, and
// the dedupe keys make every row once-only.
import { getAlertRecipientsBySite, type AlertRecipient } from "@/db/queries/alert-preferences";
import {
  getAlertsToTell,
  getRaisedMailOfAlert,
  getTemperatureUnitsByUser,
  recordAlertNotice,
  recordAlertPassedUntold,
  type AlertToTell,
  type NotifierSite,
  type OutboxRow,
} from "@/db/queries/alert-outbox";
import { clearedMail, raisedMail, reminderMail, type MailReader } from "@/lib/alerts/mail-wording";
import { receivesAlert } from "@/lib/alerts/preferences";
import { quietHoursEndAt, quietHoursOf } from "@/lib/alerts/quiet-hours";
import { ALWAYS_SENT_ALERT_KINDS, type TemperatureUnit } from "@/lib/domain";

export const dedupeKeys = {
  raised: (alertId: number, userId: string) => `alert:${alertId}:raised:${userId}`,
  reminder: (alertId: number, n: number, userId: string) => `alert:${alertId}:reminder:${n}:${userId}`,
  cleared: (alertId: number, userId: string) => `alert:${alertId}:cleared:${userId}`,
};

type Context = { site: NotifierSite; now: Date; baseUrl: string; recipients: AlertRecipient[]; units: Map<string, TemperatureUnit> };

function reader(ctx: Context, r: AlertRecipient): MailReader {
  return { name: r.name, unit: ctx.units.get(r.userId) ?? "c", site: { name: ctx.site.name, slug: ctx.site.slug, zone: ctx.site.zone }, baseUrl: ctx.baseUrl };
}

/** When a member's quiet hours end if `now` falls in them and the kind may wait; else null. */
function quietUntil(ctx: Context, r: AlertRecipient, alert: AlertToTell): Date | null {
  if (ALWAYS_SENT_ALERT_KINDS.includes(alert.kind)) return null;
  return quietHoursEndAt(ctx.now, quietHoursOf(r.preferences), ctx.site.zone);
}

function row(ctx: Context, r: AlertRecipient, alert: AlertToTell, fields: Pick<OutboxRow, "purpose" | "dedupeKey" | "status" | "dueAt"> & { subject: string; text: string; html: string }): OutboxRow {
  return {
    siteId: ctx.site.id,
    userId: r.userId,
    toAddress: r.email,
    purpose: fields.purpose,
    alertId: alert.id,
    dedupeKey: fields.dedupeKey,
    subject: fields.subject,
    bodyText: fields.text,
    bodyHtml: fields.html,
    status: fields.status,
    dueAt: fields.dueAt,
  };
}

async function announceRaised(ctx: Context, alert: AlertToTell) {
  const rows = ctx.recipients
    .filter((r) => receivesAlert(r.preferences, alert.kind))
    .map((r) => {
      const until = quietUntil(ctx, r, alert);
      const mail = raisedMail(alert, reader(ctx, r), { heldUntilQuietEnd: until !== null });
      return row(ctx, r, alert, { purpose: "alert_raised", dedupeKey: dedupeKeys.raised(alert.id, r.userId), status: until ? "held" : "waiting", dueAt: until ?? ctx.now, ...mail });
    });
  await recordAlertNotice({ alertId: alert.id, change: { step: "raised", at: ctx.now }, rows, now: ctx.now });
  return rows.length;
}

async function remind(ctx: Context, alert: AlertToTell) {
  const notice = alert.notice!;
  const last = notice.lastReminderAt ?? notice.raisedAt!;
  if (ctx.now.getTime() - last.getTime() < alert.reminderMin * 60_000) return 0;
  const number = notice.reminders + 1;
  const rows = ctx.recipients
    .filter((r) => receivesAlert(r.preferences, alert.kind) && quietUntil(ctx, r, alert) === null)
    .map((r) =>
      row(ctx, r, alert, {
        purpose: "alert_reminder",
        dedupeKey: dedupeKeys.reminder(alert.id, number, r.userId),
        status: "waiting",
        dueAt: ctx.now,
        ...reminderMail(alert, reader(ctx, r), { number, now: ctx.now }),
      }),
    );
  // The reminder counts as given even when quiet hours kept it from everyone: the next
  // one comes a whole interval later, not at the end of the quiet hours.
  await recordAlertNotice({ alertId: alert.id, change: { step: "reminder", number, at: ctx.now }, rows, now: ctx.now });
  return rows.length;
}

async function announceCleared(ctx: Context, alert: AlertToTell) {
  const byUser = new Map(ctx.recipients.map((r) => [r.userId, r]));
  const rows: OutboxRow[] = [];
  for (const opening of await getRaisedMailOfAlert({ alertId: alert.id })) {
    if (!opening.userId || !["sent", "waiting", "held"].includes(opening.status)) continue;
    const r = byUser.get(opening.userId);
    // Someone who has left the site since hears no more of it.
    if (!r) continue;
    const firstWasHeld = opening.status === "held";
    // A held opening is skipped when it comes due; its back-to-normal goes at that moment.
    const until = firstWasHeld ? opening.dueAt : quietUntil(ctx, r, alert);
    const mail = clearedMail(alert, reader(ctx, r), { firstWasHeld });
    rows.push(row(ctx, r, alert, { purpose: "alert_cleared", dedupeKey: dedupeKeys.cleared(alert.id, r.userId), status: until ? "held" : "waiting", dueAt: until ?? ctx.now, ...mail }));
  }
  await recordAlertNotice({ alertId: alert.id, change: { step: "cleared", at: ctx.now }, rows, now: ctx.now });
  return rows.length;
}

/** Writes the outbox rows a site's alerts call for at `now`; returns how many. */
export async function fanOutSite(site: NotifierSite, { now, baseUrl, watchingSince }: { now: Date; baseUrl: string; watchingSince: Date }): Promise<number> {
  const alerts = await getAlertsToTell({ siteId: site.id, now });
  if (alerts.length === 0) return 0;
  const recipients = await getAlertRecipientsBySite({ siteId: site.id });
  const units = await getTemperatureUnitsByUser({ userIds: recipients.map((r) => r.userId) });
  const ctx: Context = { site, now, baseUrl, recipients, units };
  let written = 0;
  for (const alert of alerts) {
    if (!alert.notice) {
      // Came and went while no notifier was running: noted, not sent (old news).
      if (alert.clearedAt && alert.clearedAt < watchingSince) await recordAlertPassedUntold({ alertId: alert.id, at: now });
      else written += await announceRaised(ctx, alert);
    } else if (alert.clearedAt && alert.notice.raisedAt && !alert.notice.clearedAt) {
      written += await announceCleared(ctx, alert);
    } else if (!alert.clearedAt && !alert.acknowledgedAt && alert.notice.raisedAt) {
      written += await remind(ctx, alert);
    }
  }
  return written;
}
