// The site's local days cut into stretches under one tariff rate, as real instants.
// Runtime and energy are split on these: at local midnight (so a daylight-saving day
// has 23 or 25 hours) and at each tariff-period edge.
import { DateTime } from "luxon";
import { ratePiecesOfDay, tariffOn, type Tariff } from "./tariff";

/** One stretch of one local day under one rate; `rateKey` "" where no tariff rate applies. */
export type Slice = { startMs: number; endMs: number; day: string; rateKey: string };

/** The instant a local date begins in the zone (its first moment, should midnight not exist). */
export function dayStartMs(day: string, zone: string): number {
  const start = DateTime.fromISO(day, { zone }).startOf("day");
  if (!start.isValid) throw new RangeError(`"${day}" is not a date in ${zone}`);
  return start.toMillis();
}

/** The local date (YYYY-MM-DD) an instant falls on in the zone. */
export function dayOf(ms: number, zone: string): string {
  return DateTime.fromMillis(ms, { zone }).toISODate()!;
}

export function nextDay(day: string): string {
  return DateTime.fromISO(day, { zone: "UTC" }).plus({ days: 1 }).toISODate()!;
}

export function previousDay(day: string): string {
  return DateTime.fromISO(day, { zone: "UTC" }).minus({ days: 1 }).toISODate()!;
}

/** Every local date from `fromDay` to `toDay`, both included. */
export function daysFromTo(fromDay: string, toDay: string): string[] {
  const days: string[] = [];
  for (let d = fromDay; d <= toDay; d = nextDay(d)) days.push(d);
  return days;
}

/** The slices of one local day, in order, covering it exactly. */
export function slicesOfDay(day: string, zone: string, tariffs: readonly Tariff[]): Slice[] {
  const start = DateTime.fromISO(day, { zone }).startOf("day");
  const startMs = start.toMillis();
  const endMs = dayStartMs(nextDay(day), zone);
  const pieces = ratePiecesOfDay(tariffOn(tariffs, day), start.weekday);
  const slices: Slice[] = [];
  let from = startMs;
  for (const piece of pieces) {
    // A wall-clock edge inside a spring-forward gap moves to the gap's end (luxon's
    // rule); on a fall-back day a repeated time means its first occurrence.
    const to =
      piece.toMin >= 1440
        ? endMs
        : Math.min(endMs, Math.max(from, start.set({ hour: Math.floor(piece.toMin / 60), minute: Math.floor(piece.toMin % 60) }).toMillis()));
    if (to > from) slices.push({ startMs: from, endMs: to, day, rateKey: piece.rateId });
    from = to;
  }
  return slices;
}

/** The slices of every local day from `fromDay` to `toDay`, in order. */
export function buildSlices({ zone, fromDay, toDay, tariffs }: { zone: string; fromDay: string; toDay: string; tariffs: readonly Tariff[] }): Slice[] {
  return daysFromTo(fromDay, toDay).flatMap((day) => slicesOfDay(day, zone, tariffs));
}
