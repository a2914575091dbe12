// Which local days of a plug's roll-up a change to its log or meter touches.
import { dayOf } from "./calendar";

/**
 * A change between `fromMs` and `toMs` alters the interval (or meter piece) it falls in,
 * which began at the plug's last kept switch (or sample) before it, and the one after
 * it, which ends at the next. Those days are made again.
 */
export function daysToRefresh(
  zone: string,
  change: { fromMs: number; toMs: number },
  around: { prevSwitchMs: number | null; nextSwitchMs: number | null; prevSampleMs: number | null; nextSampleMs: number | null },
): [string, string] {
  const start = Math.min(change.fromMs, around.prevSwitchMs ?? change.fromMs, around.prevSampleMs ?? change.fromMs);
  const end = Math.max(change.toMs, around.nextSwitchMs ?? change.toMs, around.nextSampleMs ?? change.toMs);
  return [dayOf(start, zone), dayOf(end, zone)];
}
