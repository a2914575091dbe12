// What an alert e-mail says: when it opens, as a reminder, and when it is back to normal.
// Figures come from the alert's detail (°C) and are shown in the reader's own unit; times
// are the site's local times.
import { ALERT_KIND_LABELS, ALWAYS_SENT_ALERT_KINDS, type AlertKind, type TemperatureUnit } from "@/lib/domain";
import { formatTemperature } from "@/lib/units";
import type { AlertDetail } from "./detail";
import { duration, localDateTime, localTime, renderMail, type MailBlock, type RenderedMail } from "./mail-text";

export type AlertForMail = {
  kind: AlertKind;
  message: string;
  detail: AlertDetail;
  raisedAt: Date;
  clearedAt: Date | null;
  clearedMessage: string | null;
  /** null for an alert about the whole site (control stopped). */
  houseName: string | null;
};

export type MailReader = {
  name: string;
  unit: TemperatureUnit;
  site: { name: string; slug: string; zone: string };
  /** The app's public address (BETTER_AUTH_URL). */
  baseUrl: string;
};

export const FROST_CHECKS = [
  "Is the heater on? Look at its plug on the Houses page, and feel for warm air at the heater.",
  "Is the door shut, and are the vents and any roof lights closed?",
  "Is the sensor in its usual place, out of a draught and off the cold glass?",
];

export const HEATER_CAUTION =
  "A word on heaters: use only heaters made for greenhouse or outdoor use, plugged into an RCD-protected socket; keep the heater's load within the plug's rating; keep the clearances its maker gives around it, away from plants, trays and fleece; and follow your local codes — any new socket or wiring work is for a licensed electrician.";

const CONTROL_STOPPED_CHECKS = [
  "Is the computer that runs Cloche switched on and connected to the network?",
  "Until control runs again, each plug keeps its last state and, once its lease runs out, falls back to its own fail-safe setting.",
];

function where(alert: AlertForMail, site: MailReader["site"]): string {
  return alert.houseName ? `in ${alert.houseName} — ${site.name}` : `— ${site.name}`;
}

export function alertsLink(reader: MailReader): string {
  return `${reader.baseUrl.replace(/\/+$/, "")}/sites/${encodeURIComponent(reader.site.slug)}/alerts`;
}

/** The figures the rule saw, as sentences in the reader's unit and the site's times. */
export function detailLines(alert: AlertForMail, reader: MailReader): string[] {
  const d = alert.detail;
  const { zone } = reader.site;
  const lines: string[] = [];
  if (d.valueC !== undefined && d.limitC !== undefined && alert.kind === "condensation") {
    // The limit here is the dew point plus the rule's margin: the alert is for air at or below it.
    lines.push(`The reading was ${formatTemperature(d.valueC, reader.unit)}; this alert is for air at or below ${formatTemperature(d.limitC, reader.unit)}, its dew point plus the margin.`);
  } else if (d.valueC !== undefined && d.limitC !== undefined) {
    const side = alert.kind === "too_cold" ? "below" : "above";
    lines.push(`The reading was ${formatTemperature(d.valueC, reader.unit)}; this alert is for ${side} ${formatTemperature(d.limitC, reader.unit)}.`);
  } else if (d.valueC !== undefined) {
    lines.push(`The reading was ${formatTemperature(d.valueC, reader.unit)}.`);
  }
  if (d.rh !== undefined) {
    lines.push(
      d.dewPointC !== undefined
        ? `Humidity ${d.rh.toFixed(0)} %, dew point ${formatTemperature(d.dewPointC, reader.unit)}.`
        : `Humidity ${d.rh.toFixed(0)} %.`,
    );
  }
  if (d.batteryPercent !== undefined) lines.push(`Battery at ${d.batteryPercent.toFixed(0)} %.`);
  if (d.reportedOn !== undefined && d.commandedOn !== undefined) {
    lines.push(`The plug reports ${d.reportedOn ? "on" : "off"}; it was last told to switch ${d.commandedOn ? "on" : "off"}.`);
  }
  if (d.sensorName) lines.push(`Sensor: ${d.sensorName}.`);
  if (d.plugName) lines.push(`Plug: ${d.plugName}.`);
  if (d.since) {
    const since = new Date(d.since);
    if (!Number.isNaN(since.getTime())) lines.push(`Since ${localDateTime(since, zone)}.`);
  }
  if (d.lastedMin !== undefined) lines.push(`It had lasted ${duration(d.lastedMin * 60_000)} when the alert opened.`);
  return lines;
}

function kindAdvice(kind: AlertKind): MailBlock[] {
  if (kind === "too_cold") return [{ p: "What to check first:" }, { list: FROST_CHECKS }, { p: HEATER_CAUTION }];
  if (kind === "controller_silent") return [{ p: "What to check:" }, { list: CONTROL_STOPPED_CHECKS }];
  return [];
}

function footer(alert: AlertForMail, reader: MailReader): MailBlock[] {
  const why = ALWAYS_SENT_ALERT_KINDS.includes(alert.kind)
    ? "Frost risk always goes out, at any hour, to every member of the site."
    : `You get this because of your alert choices for ${reader.site.name}; you can change them on the alerts page.`;
  return [{ link: "See it on the alerts page", href: alertsLink(reader) }, { p: why }];
}

export function raisedMail(alert: AlertForMail, reader: MailReader, { heldUntilQuietEnd = false } = {}): RenderedMail {
  const label = ALERT_KIND_LABELS[alert.kind];
  const zone = reader.site.zone;
  const blocks: MailBlock[] = [
    { p: `Hello ${reader.name},` },
    { p: alert.message },
    ...(detailLines(alert, reader).length ? [{ list: detailLines(alert, reader) }] : []),
    { p: `Opened at ${localDateTime(alert.raisedAt, zone)} (${zone}).${heldUntilQuietEnd ? " It was held back until your quiet hours ended." : ""}` },
    ...kindAdvice(alert.kind),
    { p: "Once someone has seen to it, acknowledge it on the alerts page and the reminders stop." },
    ...footer(alert, reader),
  ];
  return renderMail(`${label} ${where(alert, reader.site)}`, blocks);
}

export function reminderMail(alert: AlertForMail, reader: MailReader, { number, now }: { number: number; now: Date }): RenderedMail {
  const label = ALERT_KIND_LABELS[alert.kind];
  const zone = reader.site.zone;
  const blocks: MailBlock[] = [
    { p: `Hello ${reader.name},` },
    {
      p: `${label} ${alert.houseName ? `in ${alert.houseName} ` : ""}is still open: it opened at ${localDateTime(alert.raisedAt, zone)}, ${duration(now.getTime() - alert.raisedAt.getTime())} ago, and nobody has acknowledged it yet. This is reminder ${number}.`,
    },
    { p: alert.message },
    ...(detailLines(alert, reader).length ? [{ list: detailLines(alert, reader) }] : []),
    ...kindAdvice(alert.kind),
    { p: "Acknowledge it on the alerts page once someone has seen to it, and the reminders stop." },
    ...footer(alert, reader),
  ];
  return renderMail(`Still open: ${label} ${where(alert, reader.site)}`, blocks);
}

export function clearedMail(alert: AlertForMail, reader: MailReader, { firstWasHeld = false } = {}): RenderedMail {
  const label = ALERT_KIND_LABELS[alert.kind];
  const zone = reader.site.zone;
  const clearedAt = alert.clearedAt ?? alert.raisedAt;
  const lines: string[] = [];
  if (alert.detail.cleared?.valueC !== undefined) lines.push(`The reading then: ${formatTemperature(alert.detail.cleared.valueC, reader.unit)}.`);
  if (alert.detail.cleared?.rh !== undefined) lines.push(`Humidity then: ${alert.detail.cleared.rh.toFixed(0)} %.`);
  if (alert.detail.cleared?.batteryPercent !== undefined) lines.push(`Battery then: ${alert.detail.cleared.batteryPercent.toFixed(0)} %.`);
  const blocks: MailBlock[] = [
    { p: `Hello ${reader.name},` },
    { p: alert.clearedMessage ?? `${label} ${alert.houseName ? `in ${alert.houseName} ` : ""}is back to normal.` },
    ...(lines.length ? [{ list: lines }] : []),
    {
      p: `It opened at ${localDateTime(alert.raisedAt, zone)} and was back to normal at ${localTime(clearedAt, zone)} (${zone}), after ${duration(clearedAt.getTime() - alert.raisedAt.getTime())}.`,
    },
    ...(firstWasHeld
      ? [{ p: "It began and ended during your quiet hours, so the message about it opening was not sent; this one tells you what happened." }]
      : []),
    { p: "Nothing more to do." },
    ...footer(alert, reader),
  ];
  return renderMail(`Back to normal: ${label} ${where(alert, reader.site)}`, blocks);
}
