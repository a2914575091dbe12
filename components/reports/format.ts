// How the report pages write figures: one place for hours, kWh, money and dates.

export function reportFormat(currency: string) {
  const money = new Intl.NumberFormat("en-GB", { style: "currency", currency, minimumFractionDigits: 2, maximumFractionDigits: 2 });
  const one = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
  const two = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
  return {
    money: (v: number | null) => (v === null ? "–" : money.format(v)),
    hours: (v: number) => `${one.format(v)} h`,
    kwh: (v: number | null) => (v === null ? "–" : `${two.format(v)} kWh`),
    price: (v: number) => new Intl.NumberFormat("en-GB", { style: "currency", currency, minimumFractionDigits: 3, maximumFractionDigits: 4 }).format(v),
  };
}

const dayFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone: "UTC" });
const dayYearFormat = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
const monthFormat = new Intl.DateTimeFormat("en-GB", { month: "short", year: "numeric", timeZone: "UTC" });

const utcNoon = (day: string) => new Date(`${day}T12:00:00Z`);

/** "3 Dec", "3 Dec 2026", or "Dec 2026" for a month's bucket. */
export function dayLabel(day: string, { year = false, month = false } = {}) {
  if (month) return monthFormat.format(utcNoon(day));
  return (year ? dayYearFormat : dayFormat).format(utcNoon(day));
}

export function rangeLabel(from: string, to: string) {
  return from === to ? dayLabel(from, { year: true }) : `${dayLabel(from, { year: from.slice(0, 4) !== to.slice(0, 4) })} – ${dayLabel(to, { year: true })}`;
}

/** Colours for houses in the charts: calm, told apart by lightness as well as hue. */
export const HOUSE_COLOURS = ["#406c35", "#b98e61", "#596777", "#9cc38f", "#6a4932", "#8d9cab", "#2c4526", "#cfb08a"];
