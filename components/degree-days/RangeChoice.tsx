import Link from "next/link";
import { dayOf, previousDay } from "@/lib/energy/calendar";

export const DEGREE_DAY_RANGES = {
  "8w": { label: "8 weeks", days: 56 },
  "3m": { label: "3 months", days: 91 },
  "6m": { label: "6 months", days: 182 },
  "1y": { label: "A year", days: 364 },
} as const;
export type DegreeDayRange = keyof typeof DEGREE_DAY_RANGES;
export const DEFAULT_DEGREE_DAY_RANGE: DegreeDayRange = "3m";

export function degreeDayRange(value: unknown): DegreeDayRange {
  return typeof value === "string" && value in DEGREE_DAY_RANGES ? (value as DegreeDayRange) : DEFAULT_DEGREE_DAY_RANGE;
}

/** The span's local dates, up to yesterday: today is not over, so it cannot have a whole day's readings yet. */
export function spanOf(range: DegreeDayRange, zone: string, nowMs = Date.now()): { fromDay: string; toDay: string } {
  const toDay = previousDay(dayOf(nowMs, zone));
  let fromDay = toDay;
  for (let i = 1; i < DEGREE_DAY_RANGES[range].days; i++) fromDay = previousDay(fromDay);
  return { fromDay, toDay };
}

/** The report's span as links, so it can be shared and works without JavaScript. */
export function RangeChoice({ slug, current }: { slug: string; current: DegreeDayRange }) {
  return (
    <nav aria-label="Report period" className="flex flex-wrap gap-1 rounded-lg border border-frost-300 bg-white p-0.5 self-start">
      {(Object.keys(DEGREE_DAY_RANGES) as DegreeDayRange[]).map((key) => (
        <Link
          key={key}
          href={`/sites/${encodeURIComponent(slug)}/reports/degree-days?range=${key}`}
          aria-current={key === current ? "page" : undefined}
          className={`inline-flex min-h-11 min-w-16 items-center justify-center rounded-md px-3 text-sm font-semibold ${
            key === current ? "bg-leaf-700 text-white" : "text-frost-800 hover:bg-frost-100"
          }`}
        >
          {DEGREE_DAY_RANGES[key].label}
        </Link>
      ))}
    </nav>
  );
}
