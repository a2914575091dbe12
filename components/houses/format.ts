const decimal = new Intl.NumberFormat("en", { maximumFractionDigits: 2 });
const whole = new Intl.NumberFormat("en", { maximumFractionDigits: 0 });
const tenths = new Intl.NumberFormat("en", { maximumFractionDigits: 1 });
const relative = new Intl.RelativeTimeFormat("en", { numeric: "auto" });

export const formatMetres = (value: number) => decimal.format(value);
export const formatWatts = (watts: number) => `${whole.format(watts)} W`;
export const formatAmps = (amps: number) => `${tenths.format(amps)} A`;

const steps: [Intl.RelativeTimeFormatUnit, number][] = [
  ["second", 60],
  ["minute", 60],
  ["hour", 24],
  ["day", 7],
  ["week", 4.35],
  ["month", 12],
  ["year", Infinity],
];

/** "3 minutes ago", "yesterday"… relative to `now`. */
export function formatRelative(at: Date, now: Date): string {
  let amount = (at.getTime() - now.getTime()) / 1000;
  for (const [unit, size] of steps) {
    if (Math.abs(amount) < size) return relative.format(Math.round(amount), unit);
    amount /= size;
  }
  return relative.format(Math.round(amount), "year");
}

/** A full date and time in the site's zone, for tooltips. */
export function formatInstant(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    timeZone,
    timeZoneName: "short",
  }).format(at);
}
