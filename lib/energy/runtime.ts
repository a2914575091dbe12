// Runtime and energy from a plug's switch log and meter, split on the calendar's
// slices. The same functions serve the roll-up (closed intervals only), the live part
// of a report (a plug still on) and the raw computation the roll-up is checked against.
import type { Slice } from "./calendar";

/** A row of the switch log as the sums need it. */
export type LoggedSwitch = { atMs: number; toOn: boolean; ratedWatts: number | null; withdrawn: boolean };

/** A reading of a plug's own energy counter. */
export type MeterSample = { atMs: number; wattHours: number };

export type OnInterval = { startMs: number; endMs: number; watts: number };

/**
 * What one plug ran and used in one slice's day and rate. `meteredWs` is null where no
 * stretch of the plug's meter readings covers the slice (the plug does not meter, or its
 * meter was not heard): there the rated energy stands in for it when costing.
 */
export type EnergyCell = { day: string; rateKey: string; onMs: number; ratedWattMs: number; meteredWs: number | null };

/**
 * The intervals a plug was on, from its log in time order. Withdrawn switches never
 * happened and are skipped. An interval ends at the next kept switch; the last one,
 * if the plug is still on, ends at `openUntilMs`, or is left out when that is null
 * (the roll-up keeps only intervals the log has closed). An "on" while on starts a
 * new interval, so a change of rated watts takes effect from then.
 */
export function onIntervals(log: readonly LoggedSwitch[], { fallbackWatts, openUntilMs }: { fallbackWatts: number; openUntilMs: number | null }): OnInterval[] {
  const intervals: OnInterval[] = [];
  let open: { startMs: number; watts: number } | null = null;
  for (const row of log) {
    if (row.withdrawn) continue;
    if (open && row.atMs > open.startMs) intervals.push({ startMs: open.startMs, endMs: row.atMs, watts: open.watts });
    open = row.toOn ? { startMs: row.atMs, watts: row.ratedWatts ?? fallbackWatts } : null;
  }
  if (open && openUntilMs !== null && openUntilMs > open.startMs) intervals.push({ startMs: open.startMs, endMs: openUntilMs, watts: open.watts });
  return intervals;
}

/** Energy between consecutive meter samples, in watt-seconds; a counter that went back was reset to zero. */
export type MeterPiece = { startMs: number; endMs: number; ws: number };

export function meterPieces(samples: readonly MeterSample[]): MeterPiece[] {
  const pieces: MeterPiece[] = [];
  for (let i = 1; i < samples.length; i++) {
    const a = samples[i - 1]!;
    const b = samples[i]!;
    if (b.atMs <= a.atMs) continue;
    const wh = b.wattHours >= a.wattHours ? b.wattHours - a.wattHours : b.wattHours;
    pieces.push({ startMs: a.atMs, endMs: b.atMs, ws: wh * 3600 });
  }
  return pieces;
}

/** The first slice that ends after `ms` (slices are in order and do not overlap). */
function firstSliceAfter(slices: readonly Slice[], ms: number): number {
  let lo = 0;
  let hi = slices.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (slices[mid]!.endMs <= ms) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export const cellKey = (day: string, rateKey: string) => `${day}|${rateKey}`;

/**
 * Adds intervals (runtime and rated energy) and meter pieces (spread evenly over their
 * time) into cells by slice. Time outside the slices is not counted: that is how a
 * report's edges clip. `cells` is filled in place and returned.
 */
export function accumulate(
  slices: readonly Slice[],
  intervals: readonly OnInterval[],
  pieces: readonly MeterPiece[] | null,
  cells: Map<string, EnergyCell> = new Map(),
): Map<string, EnergyCell> {
  const cellOf = (slice: Slice) => {
    const key = cellKey(slice.day, slice.rateKey);
    let cell = cells.get(key);
    if (!cell) cells.set(key, (cell = { day: slice.day, rateKey: slice.rateKey, onMs: 0, ratedWattMs: 0, meteredWs: null }));
    return cell;
  };
  for (const interval of intervals) {
    for (let i = firstSliceAfter(slices, interval.startMs); i < slices.length; i++) {
      const slice = slices[i]!;
      if (slice.startMs >= interval.endMs) break;
      const ms = Math.min(slice.endMs, interval.endMs) - Math.max(slice.startMs, interval.startMs);
      if (ms <= 0) continue;
      const cell = cellOf(slice);
      cell.onMs += ms;
      cell.ratedWattMs += ms * interval.watts;
    }
  }
  for (const piece of pieces ?? []) {
    const span = piece.endMs - piece.startMs;
    for (let i = firstSliceAfter(slices, piece.startMs); i < slices.length; i++) {
      const slice = slices[i]!;
      if (slice.startMs >= piece.endMs) break;
      const ms = Math.min(slice.endMs, piece.endMs) - Math.max(slice.startMs, piece.startMs);
      if (ms <= 0) continue;
      const cell = cellOf(slice);
      cell.meteredWs = (cell.meteredWs ?? 0) + (piece.ws * ms) / span;
    }
  }
  return cells;
}

/**
 * A plug's roll-up cells for the days `slices` cover: the intervals its log has closed
 * (never the one still open) and its meter's pieces. Cells with nothing in them are left out.
 */
export function rollupCells(
  plug: { applianceWatts: number; metersEnergy: boolean },
  slices: readonly Slice[],
  log: readonly LoggedSwitch[],
  samples: readonly MeterSample[] | null,
): EnergyCell[] {
  const intervals = onIntervals(log, { fallbackWatts: plug.applianceWatts, openUntilMs: null });
  const pieces = plug.metersEnergy ? meterPieces(samples ?? []) : null;
  return [...accumulate(slices, intervals, pieces).values()].filter((c) => c.onMs > 0 || (c.meteredWs ?? 0) > 0);
}

/**
 * kWh = kW × h: 1 kWh is 3.6e6 watt-seconds, 3.6e9 watt-milliseconds. Divided, not
 * multiplied by a reciprocal, so whole figures come out whole (7.2e6 W·s is 2 kWh).
 */
export const wattMsToKwh = (wattMs: number) => wattMs / 3_600_000_000;
export const wsToKwh = (ws: number) => ws / 3_600_000;
