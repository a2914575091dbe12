// The report ranges a person picks from, worked out in the site's own calendar.
import { DateTime } from "luxon";
import type { ReportBucket } from "./report";

export type ReportRange = { label: string; from: string; to: string };

export function presetRanges(todayIso: string): ReportRange[] {
  const today = DateTime.fromISO(todayIso, { zone: "UTC" });
  const iso = (d: DateTime) => d.toISODate()!;
  const lastMonth = today.minus({ months: 1 });
  return [
    { label: "This month", from: iso(today.startOf("month")), to: iso(today.endOf("month")) },
    { label: "Last month", from: iso(lastMonth.startOf("month")), to: iso(lastMonth.endOf("month")) },
    { label: "Last 7 days", from: iso(today.minus({ days: 6 })), to: iso(today) },
    { label: "Last 30 days", from: iso(today.minus({ days: 29 })), to: iso(today) },
    { label: "This year", from: iso(today.startOf("year")), to: iso(today.endOf("year")) },
  ];
}

/** Days for up to two months, weeks up to half a year, months beyond. */
export function defaultBucket(days: number): ReportBucket {
  return days <= 62 ? "day" : days <= 186 ? "week" : "month";
}
