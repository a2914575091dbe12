// Wall-clock times of a file to instants in its time zone, with the zone's own rules
// (the IANA tz database, through Intl). A time in the hour the clocks skip does not
// exist; a time in the hour they repeat happens twice. Offsets are looked up once per
// quarter hour of UTC (every transition in the tz database since 1970 falls on one).
import { IANAZone } from "luxon";
import { wallMs, type WallClock } from "./formats";

const SLOT_MS = 15 * 60_000;
const DAY_MS = 86_400_000;

export type LocalInstant =
  | { kind: "one"; ms: number }
  /** The repeated hour: both instants, earlier first. */
  | { kind: "two"; first: number; second: number }
  /** The skipped hour: the clocks went from `fromLocal` to `toLocal` (HH:mm) at `atMs`. */
  | { kind: "gap"; atMs: number; fromLocal: string; toLocal: string };

export type ZoneReader = { toInstant: (wall: WallClock) => LocalInstant; offsetAt: (ms: number) => number };

const hhmm = (ms: number) => new Date(ms).toISOString().slice(11, 16);

export function zoneReader(zoneName: string): ZoneReader {
  const zone = IANAZone.create(zoneName);
  if (!zone.isValid) throw new Error(`unknown time zone ${zoneName}`);
  const cache = new Map<number, number>();
  /** Minutes east of UTC at an instant. */
  const offsetAt = (ms: number) => {
    const slot = Math.floor(ms / SLOT_MS);
    let offset = cache.get(slot);
    if (offset === undefined) {
      offset = zone.offset(slot * SLOT_MS);
      cache.set(slot, offset);
    }
    return offset;
  };

  function toInstant(wall: WallClock): LocalInstant {
    const asUtc = wallMs(wall);
    const before = offsetAt(asUtc - DAY_MS);
    const after = offsetAt(asUtc + DAY_MS);
    const valid = [...new Set([before, after])].map((o) => asUtc - o * 60_000).filter((ms) => offsetAt(ms) * 60_000 === asUtc - ms);
    if (valid.length === 1) return { kind: "one", ms: valid[0]! };
    if (valid.length === 2) {
      const [first, second] = valid.sort((a, b) => a - b) as [number, number];
      return { kind: "two", first, second };
    }
    // In the gap: find the transition between the two offsets' readings, to the minute.
    let lo = asUtc - Math.max(before, after) * 60_000;
    let hi = asUtc - Math.min(before, after) * 60_000;
    while (hi - lo > 60_000) {
      const mid = Math.floor((lo + hi) / 2 / 60_000) * 60_000;
      if (offsetAt(mid) === before) lo = mid;
      else hi = mid;
    }
    return { kind: "gap", atMs: hi, fromLocal: hhmm(hi + before * 60_000), toLocal: hhmm(hi + after * 60_000) };
  }

  return { toInstant, offsetAt };
}
