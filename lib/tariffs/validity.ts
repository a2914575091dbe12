// A site's tariffs over the calendar: which one is current, which stored tariff a new
// one would overlap, and which local days the roll-up must make again after a change.
import { tariffOn, type Tariff } from "@/lib/energy/tariff";

export type Validity = { validFrom: string; validUntil: string | null };
export type NamedValidity = Validity & { id: string; name: string };

/** The first stored tariff whose dates share a day with the candidate's, or null. */
export function overlappingTariff(candidate: Validity, others: readonly NamedValidity[]): NamedValidity | null {
  const end = candidate.validUntil ?? "9999-12-31";
  for (const other of others) {
    const otherEnd = other.validUntil ?? "9999-12-31";
    if (candidate.validFrom <= otherEnd && other.validFrom <= end) return other;
  }
  return null;
}

const dateFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

/** "12 Mar 2026" for a local date (YYYY-MM-DD). */
export function formatDay(day: string): string {
  return dateFormat.format(new Date(`${day}T00:00:00Z`));
}

/** "1 Jan 2026 – 31 Dec 2026", or "from 1 Jan 2026" when open-ended. */
export function describeValidity({ validFrom, validUntil }: Validity): string {
  return validUntil === null ? `from ${formatDay(validFrom)}, no end date` : `${formatDay(validFrom)} – ${formatDay(validUntil)}`;
}

/** The id of the tariff in force on `today` (the reports' own rule), or null. */
export function currentTariffId(tariffs: readonly Tariff[], today: string): string | null {
  return tariffOn(tariffs, today)?.id ?? null;
}

/**
 * The local days whose roll-up a tariff change touches: the union of the old and new
 * validity (either may be absent on create or delete), bounded to the days the site
 * has switches or meter samples on (`activity`), an open end taken as the last such day.
 * Null when nothing recorded falls in it.
 */
export function daysToRefresh(
  before: Validity | null,
  after: Validity | null,
  activity: { firstDay: string; lastDay: string } | null,
): { fromDay: string; toDay: string } | null {
  const ranges = [before, after].filter((v): v is Validity => v !== null);
  if (!activity || ranges.length === 0) return null;
  const from = ranges.map((r) => r.validFrom).reduce((a, b) => (a < b ? a : b));
  const until = ranges.some((r) => r.validUntil === null) ? activity.lastDay : ranges.map((r) => r.validUntil!).reduce((a, b) => (a > b ? a : b));
  const fromDay = from > activity.firstDay ? from : activity.firstDay;
  const toDay = until < activity.lastDay ? until : activity.lastDay;
  return fromDay <= toDay ? { fromDay, toDay } : null;
}
