// The roll-up, kept the way the controller keeps it (days made again after each batch
// of switches, late withdrawals and meter samples arrives, sometimes out of order),
// sums to exactly what one pass over the whole raw log gives: runtime to the
// millisecond, rated energy to the watt-millisecond, metered energy to the watt-second.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildSlices, dayOf, dayStartMs, nextDay } from "@/lib/energy/calendar";
import { daysToRefresh } from "@/lib/energy/refresh";
import { accumulate, cellKey, meterPieces, onIntervals, rollupCells, type EnergyCell, type LoggedSwitch, type MeterSample } from "@/lib/energy/runtime";
import type { Tariff } from "@/lib/energy/tariff";

const H = 3_600_000;
const D = 24 * H;
const EVERY_DAY = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"] as const;

// Daylight-saving changes of 2026 (IANA tz database): each case is centred on one.
const ZONES = [
  { zone: "Europe/London", around: "2026-03-29" },
  { zone: "Europe/London", around: "2026-10-25" },
  { zone: "America/New_York", around: "2026-03-08" },
  { zone: "America/New_York", around: "2026-11-01" },
  { zone: "Australia/Sydney", around: "2026-04-05" },
  { zone: "Australia/Sydney", around: "2026-10-04" },
] as const;

/** Two tariffs that change on the middle day, with different edges (one wrapping past midnight). */
function tariffsChangingOn(day: string): Tariff[] {
  const rates = (prefix: string, from: string, to: string) => [
    { id: `${prefix}-low`, label: "Low", startsAt: from, endsAt: to, days: EVERY_DAY, pricePerKwh: 0.1 },
    { id: `${prefix}-high`, label: "High", startsAt: to, endsAt: from, days: EVERY_DAY, pricePerKwh: 0.3 },
  ];
  return [
    { id: "a", name: "A", kind: "time_of_use", validFrom: "2026-01-01", validUntil: day, standingChargePerDay: 0, taxPercent: 0, rates: rates("a", "00:30", "07:30") },
    { id: "b", name: "B", kind: "time_of_use", validFrom: nextDay(day), validUntil: null, standingChargePerDay: 0, taxPercent: 0, rates: rates("b", "01:15", "05:45") },
  ];
}

type Stored = LoggedSwitch & { id: number };
type Arrival = { kind: "switch"; row: Omit<Stored, "id"> } | { kind: "withdraw"; pick: number } | { kind: "sample"; sample: MeterSample };

/** The roll-up table as the controller keeps it, and the log and meter it reads from. */
class Model {
  log: Stored[] = [];
  samples: MeterSample[] = [];
  table = new Map<string, EnergyCell>();
  constructor(
    readonly zone: string,
    readonly tariffs: Tariff[],
    readonly plug: { applianceWatts: number; metersEnergy: boolean },
  ) {}

  private sortedLog() {
    return [...this.log].sort((a, b) => a.atMs - b.atMs || a.id - b.id);
  }

  /** As db/energy-days.ts's switchesAround: the last kept before, all within, the first kept at or after. */
  private switchesAround(fromMs: number, toMs: number) {
    const log = this.sortedLog();
    const before = log.filter((r) => r.atMs < fromMs && !r.withdrawn).at(-1);
    const within = log.filter((r) => r.atMs >= fromMs && r.atMs < toMs);
    const after = log.find((r) => r.atMs >= toMs && !r.withdrawn);
    return [...(before ? [before] : []), ...within, ...(after ? [after] : [])];
  }

  private samplesAround(fromMs: number, toMs: number) {
    const sorted = [...this.samples].sort((a, b) => a.atMs - b.atMs);
    const before = sorted.filter((s) => s.atMs < fromMs).at(-1);
    const after = sorted.find((s) => s.atMs >= toMs);
    return [...(before ? [before] : []), ...sorted.filter((s) => s.atMs >= fromMs && s.atMs < toMs), ...(after ? [after] : [])];
  }

  /** As refreshEnergyDays: the days the change touches, made again whole. */
  refresh(fromMs: number, toMs: number) {
    const kept = this.sortedLog().filter((r) => !r.withdrawn);
    const samples = [...this.samples].sort((a, b) => a.atMs - b.atMs);
    const [fromDay, toDay] = daysToRefresh(
      this.zone,
      { fromMs, toMs },
      {
        prevSwitchMs: kept.filter((r) => r.atMs < fromMs).at(-1)?.atMs ?? null,
        nextSwitchMs: kept.find((r) => r.atMs > toMs)?.atMs ?? null,
        prevSampleMs: this.plug.metersEnergy ? (samples.filter((s) => s.atMs < fromMs).at(-1)?.atMs ?? null) : null,
        nextSampleMs: this.plug.metersEnergy ? (samples.find((s) => s.atMs > toMs)?.atMs ?? null) : null,
      },
    );
    const startMs = dayStartMs(fromDay, this.zone);
    const endMs = dayStartMs(nextDay(toDay), this.zone);
    for (const [key, cell] of this.table) if (cell.day >= fromDay && cell.day <= toDay) this.table.delete(key);
    const slices = buildSlices({ zone: this.zone, fromDay, toDay, tariffs: this.tariffs });
    const cells = rollupCells(this.plug, slices, this.switchesAround(startMs, endMs), this.plug.metersEnergy ? this.samplesAround(startMs, endMs) : null);
    for (const cell of cells) this.table.set(cellKey(cell.day, cell.rateKey), cell);
  }

  take(batch: Arrival[]) {
    let fromMs = Infinity;
    let toMs = -Infinity;
    const touch = (ms: number) => {
      fromMs = Math.min(fromMs, ms);
      toMs = Math.max(toMs, ms);
    };
    for (const a of batch) {
      if (a.kind === "switch") {
        this.log.push({ ...a.row, id: this.log.length + 1 });
        touch(a.row.atMs);
      } else if (a.kind === "withdraw") {
        const target = this.log.filter((r) => !r.withdrawn)[a.pick % Math.max(1, this.log.length)];
        if (target) {
          target.withdrawn = true;
          touch(target.atMs);
        }
      } else if (this.plug.metersEnergy && !this.samples.some((s) => s.atMs === a.sample.atMs)) {
        this.samples.push(a.sample);
        touch(a.sample.atMs);
      }
    }
    if (fromMs <= toMs) this.refresh(fromMs, toMs);
  }
}

const arrival = (startMs: number, spanMs: number): fc.Arbitrary<Arrival> =>
  fc.oneof(
    { weight: 6, arbitrary: fc.record({ at: fc.integer({ min: 0, max: spanMs }), on: fc.boolean(), watts: fc.integer({ min: 50, max: 3500 }) }).map(({ at, on, watts }) => ({ kind: "switch" as const, row: { atMs: startMs + at, toOn: on, ratedWatts: on ? watts : null, withdrawn: false } })) },
    { weight: 1, arbitrary: fc.nat(1000).map((pick) => ({ kind: "withdraw" as const, pick })) },
    { weight: 3, arbitrary: fc.record({ at: fc.integer({ min: 0, max: spanMs }), wh: fc.integer({ min: 0, max: 50_000 }) }).map(({ at, wh }) => ({ kind: "sample" as const, sample: { atMs: startMs + at, wattHours: wh } })) },
  );

describe("the energy roll-up", () => {
  it("equals the raw computation over random logs across daylight-saving days, tariff changes and late or withdrawn switches", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...ZONES).chain(({ zone, around }) => {
          const startMs = dayStartMs(around, zone) - 3 * D;
          const spanMs = 6 * D;
          return fc.record({
            zone: fc.constant(zone),
            around: fc.constant(around),
            startMs: fc.constant(startMs),
            metersEnergy: fc.boolean(),
            // Batches as the switch log writes them; within a batch and between batches the
            // times are in any order, as late rows and out-of-order writes would be.
            batches: fc.array(fc.array(arrival(startMs, spanMs), { minLength: 1, maxLength: 6 }), { minLength: 1, maxLength: 25 }),
            // The report's range: from one to five days inside the log's span, so plugs are
            // on at its start and at its end.
            reportFrom: fc.integer({ min: 0, max: 3 }),
            reportDays: fc.integer({ min: 1, max: 5 }),
            nowAfterMs: fc.integer({ min: 1, max: 2 * D }),
          });
        }),
        ({ zone, around, startMs, metersEnergy, batches, reportFrom, reportDays, nowAfterMs }) => {
          const tariffs = tariffsChangingOn(around);
          const model = new Model(zone, tariffs, { applianceWatts: 1500, metersEnergy });
          for (const batch of batches) model.take(batch);
          const nowMs = startMs + 6 * D + nowAfterMs;

          let fromDay = dayOf(startMs, zone);
          for (let i = 0; i < reportFrom; i++) fromDay = nextDay(fromDay);
          let toDay = fromDay;
          for (let i = 1; i < reportDays; i++) toDay = nextDay(toDay);
          const slices = buildSlices({ zone, fromDay, toDay, tariffs });

          // Raw: one pass over the whole log and meter, the last interval open until now.
          const log = [...model.log].sort((a, b) => a.atMs - b.atMs || a.id - b.id);
          const samples = [...model.samples].sort((a, b) => a.atMs - b.atMs);
          const raw = accumulate(slices, onIntervals(log, { fallbackWatts: 1500, openUntilMs: nowMs }), metersEnergy ? meterPieces(samples) : null);

          // Roll-up: the table's cells in range, plus the part still on since the last kept switch.
          const rolled = new Map<string, EnergyCell>();
          for (const cell of model.table.values()) if (cell.day >= fromDay && cell.day <= toDay) rolled.set(cellKey(cell.day, cell.rateKey), { ...cell });
          const last = log.filter((r) => !r.withdrawn).at(-1);
          if (last?.toOn) accumulate(slices, onIntervals([last], { fallbackWatts: 1500, openUntilMs: nowMs }), null, rolled);

          const keys = new Set([...raw.keys(), ...rolled.keys()]);
          for (const key of keys) {
            const r = raw.get(key);
            const u = rolled.get(key);
            expect(u?.onMs ?? 0, key).toBe(r?.onMs ?? 0);
            expect(u?.ratedWattMs ?? 0, key).toBe(r?.ratedWattMs ?? 0);
            expect(Math.abs((u?.meteredWs ?? 0) - (r?.meteredWs ?? 0)), key).toBeLessThan(1);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});
