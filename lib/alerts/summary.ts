// The daily summary: which stretch of time it covers, and what it says.
//
// Which day: a summary time before 12:00 sends a summary of yesterday, the whole local
// day (a morning read of the night); a time from 12:00 on sends a summary of today, from
// local midnight up to the summary time (an evening read of the day so far). Either way
// each site gets at most one per local day, keyed by the day it covers.
import { DateTime } from "luxon";
import { ALERT_KIND_LABELS, type AlertKind, type TemperatureUnit } from "@/lib/domain";
import { formatKwh, formatMoney } from "@/lib/tariffs/money";
import { formatTemperature } from "@/lib/units";
import { YESTERDAY_BEFORE_HOUR } from "./summary-covers";
import { localDay, localTime, renderMail, type MailBlock, type RenderedMail } from "./mail-text";

export type SummaryWindow = {
  /** The local date covered. */
  day: string;
  from: Date;
  /** The end of the stretch covered: the next local midnight, or the summary time today. */
  to: Date;
  wholeDay: boolean;
};

/**
 * The stretch a site's summary covers if it is due at `now`: null before the summary
 * time of the local day, or when there is no summary time.
 */
export function summaryWindowAt(now: Date, zone: string, summaryTime: string | null): SummaryWindow | null {
  if (!summaryTime) return null;
  const match = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(summaryTime);
  if (!match) throw new RangeError(`"${summaryTime}" is not a time of day (HH:MM)`);
  const local = DateTime.fromJSDate(now, { zone });
  if (!local.isValid) throw new RangeError(`"${zone}" is not a time zone`);
  const today = local.startOf("day");
  const hour = Number(match[1]);
  const sendAt = DateTime.fromObject({ year: today.year, month: today.month, day: today.day, hour, minute: Number(match[2]) }, { zone });
  if (local < sendAt) return null;
  if (hour < YESTERDAY_BEFORE_HOUR) {
    const yesterday = today.minus({ days: 1 });
    return { day: yesterday.toISODate()!, from: yesterday.toJSDate(), to: today.toJSDate(), wholeDay: true };
  }
  return { day: today.toISODate()!, from: today.toJSDate(), to: sendAt.toJSDate(), wholeDay: false };
}

export type SummaryAlert = { kind: AlertKind; message: string; raisedAt: Date; clearedAt: Date | null };
export type SummaryExtreme = { c: number; at: Date };
export type SummaryFigures = { onHours: number; kwh: number; cost: number | null };

export type SummaryContent = {
  window: SummaryWindow;
  site: { name: string; slug: string; zone: string; currency: string };
  houses: (SummaryFigures & { name: string; min: SummaryExtreme | null; max: SummaryExtreme | null; alerts: SummaryAlert[] })[];
  /** Alerts about the whole site (control stopped). */
  siteAlerts: SummaryAlert[];
  totals: SummaryFigures & { standingCharge: number; total: number | null };
};

const hours = (h: number) => `${h.toFixed(1)} h`;
const money = (value: number | null, currency: string) => (value === null ? "no tariff covers it" : formatMoney(value, currency));

function alertLine(a: SummaryAlert, zone: string, window: SummaryWindow): string {
  const opened = a.raisedAt < window.from ? "open from before" : `from ${localTime(a.raisedAt, zone)}`;
  const closed = a.clearedAt === null || a.clearedAt > window.to ? "still open" : `back to normal at ${localTime(a.clearedAt, zone)}`;
  return `${ALERT_KIND_LABELS[a.kind]}: ${a.message} (${opened}, ${closed})`;
}

export function summaryMail(content: SummaryContent, reader: { name: string; unit: TemperatureUnit; baseUrl: string }): RenderedMail {
  const { window, site } = content;
  const zone = site.zone;
  const covers = window.wholeDay
    ? `This covers the whole of ${localDay(window.day)}, midnight to midnight (${zone}).`
    : `This covers ${localDay(window.day)} from midnight up to ${localTime(window.to, zone)} (${zone}); the rest of the day comes in tomorrow's reports.`;
  const blocks: MailBlock[] = [{ p: `Hello ${reader.name},` }, { p: `Here is how ${site.name}'s houses did. ${covers}` }];
  for (const house of content.houses) {
    const lines = [
      house.min && house.max
        ? `Coldest ${formatTemperature(house.min.c, reader.unit)} at ${localTime(house.min.at, zone)}; warmest ${formatTemperature(house.max.c, reader.unit)} at ${localTime(house.max.at, zone)}.`
        : "No temperature readings from inside this house.",
      `Heating and other plugs ran ${hours(house.onHours)}, using ${formatKwh(house.kwh)} (${money(house.cost, site.currency)}).`,
      house.alerts.length ? `Alerts: ${house.alerts.length}.` : "No alerts.",
    ];
    blocks.push({ heading: house.name }, { list: lines });
    if (house.alerts.length) blocks.push({ list: house.alerts.map((a) => alertLine(a, zone, window)) });
  }
  if (content.siteAlerts.length) blocks.push({ heading: "The whole site" }, { list: content.siteAlerts.map((a) => alertLine(a, zone, window)) });
  const t = content.totals;
  blocks.push(
    { heading: "All houses" },
    {
      list: [
        `Runtime ${hours(t.onHours)}, ${formatKwh(t.kwh)}, energy ${money(t.cost, site.currency)}.`,
        `With the day's standing charge (${formatMoney(t.standingCharge, site.currency)}): ${money(t.total, site.currency)}.`,
      ],
    },
    { p: "The figures are the reports' own, so they match the Reports page for the same day." },
    { link: "Open the alerts page", href: `${reader.baseUrl.replace(/\/+$/, "")}/sites/${encodeURIComponent(site.slug)}/alerts` },
    { p: `You get this summary because it is switched on in your alert choices for ${site.name}.` },
  );
  const subject = window.wholeDay
    ? `Daily summary for ${site.name} — ${localDay(window.day)}`
    : `Daily summary for ${site.name} — ${localDay(window.day)} until ${localTime(window.to, zone)}`;
  return renderMail(subject, blocks);
}
