// The words of the alerts page: an alert's figures in the reader's unit, and where each
// of its e-mails stands, so a retry or a hold is visible, not guessed.
import type { AlertDelivery, AlertItem } from "@/db/queries/alerts";
import type { AlertDetail } from "@/lib/alerts/detail";
import type { MailPurpose, TemperatureUnit } from "@/lib/domain";
import { formatTemperature } from "@/lib/units";
import { formatSiteTime } from "@/components/houses/live-format";

export type AlertJson = AlertItem;
export type DeliveryJson = AlertDelivery;

const percent = (n: number) => `${Math.round(n)} %`;

function duration(minutes: number): string {
  if (minutes < 60) return `${Math.round(minutes)} min`;
  const hours = Math.floor(minutes / 60);
  const rest = Math.round(minutes % 60);
  return rest ? `${hours} h ${rest} min` : `${hours} h`;
}

/** "Reading 1.2 °C, limit 2.0 °C", "Humidity 96 %, dew point 8.1 °C", …: what the rule saw when it opened. */
export function alertFigures(detail: AlertDetail, unit: TemperatureUnit): string[] {
  const lines: string[] = [];
  const t = (c: number) => formatTemperature(c, unit);
  if (detail.valueC !== undefined && detail.limitC !== undefined) lines.push(`Reading ${t(detail.valueC)}, limit ${t(detail.limitC)}`);
  else if (detail.valueC !== undefined) lines.push(`Reading ${t(detail.valueC)}`);
  else if (detail.limitC !== undefined) lines.push(`Limit ${t(detail.limitC)}`);
  if (detail.rh !== undefined) lines.push(detail.dewPointC !== undefined ? `Humidity ${percent(detail.rh)}, dew point ${t(detail.dewPointC)}` : `Humidity ${percent(detail.rh)}`);
  if (detail.batteryPercent !== undefined) lines.push(`Battery ${percent(detail.batteryPercent)}`);
  if (detail.reportedOn !== undefined && detail.commandedOn !== undefined) {
    lines.push(`Plug reports ${detail.reportedOn ? "on" : "off"}, was told ${detail.commandedOn ? "on" : "off"}`);
  }
  if (detail.lastedMin !== undefined) lines.push(`Had lasted ${duration(detail.lastedMin)} when raised`);
  return lines;
}

/** What the reading or state was when it came back to normal. */
export function clearedFigures(detail: AlertDetail, unit: TemperatureUnit): string | null {
  const c = detail.cleared;
  if (!c) return null;
  const parts: string[] = [];
  if (c.valueC !== undefined) parts.push(formatTemperature(c.valueC, unit));
  if (c.rh !== undefined) parts.push(`humidity ${percent(c.rh)}`);
  if (c.batteryPercent !== undefined) parts.push(`battery ${percent(c.batteryPercent)}`);
  return parts.length ? parts.join(", ") : null;
}

export const MAIL_PURPOSE_WORDS: Record<MailPurpose, string> = {
  alert_raised: "Alert",
  alert_reminder: "Reminder",
  alert_cleared: "Back to normal",
  daily_summary: "Daily summary",
};

/**
 * Where an e-mail stands: "sent 02:13", "held for quiet hours until 07:00", "not sent
 * yet: 3 tries, last: connection refused, next try 02:20", "skipped: …", "given up …".
 */
export function deliveryWords(d: DeliveryJson, now: Date, timeZone: string): string {
  const at = (iso: string) => formatSiteTime(new Date(iso), now, timeZone);
  switch (d.status) {
    case "sent":
      return `sent ${d.sentAt ? at(d.sentAt) : ""}`.trim();
    case "held":
      return `held for quiet hours until ${at(d.dueAt)}`;
    case "waiting":
      return d.attempts === 0
        ? `waiting to go, due ${at(d.dueAt)}`
        : `not sent yet: ${d.attempts} ${d.attempts === 1 ? "try" : "tries"}, last: ${d.lastError ?? "no reason given"}, next try ${at(d.dueAt)}`;
    case "skipped":
      return `skipped: ${d.lastError ?? "no reason given"}`;
    case "given_up":
      return `given up after ${d.attempts} ${d.attempts === 1 ? "try" : "tries"}${d.lastError ? `, last: ${d.lastError}` : ""}`;
  }
}

/** An e-mail that has not gone and may need someone to look (the mail server, an address). */
export const deliveryInTrouble = (d: DeliveryJson) => d.status === "given_up" || (d.status === "waiting" && d.attempts > 0);
