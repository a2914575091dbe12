import { formatSiteTime } from "@/components/houses/live-format";

export { formatSiteTime };

/** "2026-03-01T14:30": the local date and time in `timeZone`, as a date-time field takes it. */
export function localInputValue(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat("sv-SE", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(at);
  return parts.replace(" ", "T");
}
