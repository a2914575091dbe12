// How the report pages write figures: hours, kWh and dates; money as the tariff pages write it.
import { formatMoney, formatUnitPrice } from "@/lib/tariffs/money";

export function reportFormat(currency: string) {
  const one = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
  const two = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
  return {
    money: (v: number | null) => (v === null ? "–" : formatMoney(v, currency)),
    hours: (v: number) => `${one.format(v)} h`,
    kwh: (v: number | null) => (v === null ? "–" : `${two.format(v)} kWh`),
    price: (v: number) => formatUnitPrice(v, currency),
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
