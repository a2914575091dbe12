// The daily summary of a site, once its local time has passed the summary time: one
// e-mail per member who has it on, recorded once per site and local day. The figures
// are the reports' own (getEnergyReport for that day), so the summary and the Reports
// page agree.
import { getAlertRecipientsBySite } from "@/db/queries/alert-preferences";
import { getTemperatureUnitsByUser, type NotifierSite, type OutboxRow } from "@/db/queries/alert-outbox";
import { getAlertsDuring, getHouseExtremesBySite, hasDailySummary, recordDailySummary } from "@/db/queries/daily-summary";
import { getEnergyReport } from "@/db/queries/energy";
import { summaryMail, summaryWindowAt, type SummaryContent, type SummaryWindow } from "@/lib/alerts/summary";

export const summaryDedupeKey = (siteId: string, day: string, userId: string) => `summary:${siteId}:${day}:${userId}`;

/** What the summary of a site says for a stretch, in °C (each reader's unit is applied per e-mail). */
export async function dailySummaryContent(site: NotifierSite, window: SummaryWindow): Promise<SummaryContent> {
  const [report, extremes, alerts] = await Promise.all([
    // `now` at the end of the stretch: a plug still on counts up to there, as the report page would then.
    getEnergyReport({ siteId: site.id, fromDay: window.day, toDay: window.day, bucket: "day", now: window.to }),
    getHouseExtremesBySite({ siteId: site.id, from: window.from, to: window.to }),
    getAlertsDuring({ siteId: site.id, from: window.from, to: window.to }),
  ]);
  const figures = new Map(report.houses.map((h) => [h.id, h]));
  return {
    window,
    site: { name: site.name, slug: site.slug, zone: site.zone, currency: site.currency },
    houses: extremes.map((h) => {
      const f = figures.get(h.id);
      return {
        name: h.name,
        min: h.min,
        max: h.max,
        onHours: f?.onHours ?? 0,
        kwh: f?.costedKwh ?? 0,
        cost: f ? f.cost : null,
        alerts: alerts.filter((a) => a.houseId === h.id),
      };
    }),
    siteAlerts: alerts.filter((a) => a.houseId === null),
    totals: { onHours: report.site.onHours, kwh: report.site.costedKwh, cost: report.site.cost, standingCharge: report.site.standingCharge, total: report.site.total },
  };
}

/** Writes the site's summary e-mails if one is due at `now` and not yet written; returns how many. */
export async function composeDailySummary(site: NotifierSite, { now, baseUrl }: { now: Date; baseUrl: string }): Promise<number | null> {
  const window = summaryWindowAt(now, site.zone, site.summaryTime);
  if (!window || (await hasDailySummary({ siteId: site.id, day: window.day }))) return null;
  const recipients = (await getAlertRecipientsBySite({ siteId: site.id })).filter((r) => r.preferences.dailySummary);
  const units = await getTemperatureUnitsByUser({ userIds: recipients.map((r) => r.userId) });
  const content = recipients.length ? await dailySummaryContent(site, window) : null;
  const rows: OutboxRow[] = recipients.map((r) => {
    const mail = summaryMail(content!, { name: r.name, unit: units.get(r.userId) ?? "c", baseUrl });
    return {
      siteId: site.id,
      userId: r.userId,
      toAddress: r.email,
      purpose: "daily_summary",
      alertId: null,
      summaryDay: window.day,
      dedupeKey: summaryDedupeKey(site.id, window.day, r.userId),
      subject: mail.subject,
      bodyText: mail.text,
      bodyHtml: mail.html,
      status: "waiting",
      dueAt: now,
    };
  });
  return (await recordDailySummary({ siteId: site.id, day: window.day, rows, now })) ? rows.length : null;
}
