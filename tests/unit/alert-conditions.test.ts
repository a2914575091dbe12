// One alert condition over time: minimum duration before it opens, hysteresis before it closes.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CLOSED, limits, stepCondition, type ConditionChange, type ConditionState } from "@/lib/alerts/conditions";

const MIN = 60_000;

/** Runs values through a frost-style rule (wrong at or below `limit`, right above limit + hysteresis). */
function run(values: [atMs: number, value: number][], limit: number, hysteresis: number, holdMs: number) {
  let state: ConditionState = CLOSED;
  const changes: { atMs: number; change: ConditionChange }[] = [];
  for (const [atMs, value] of values) {
    const f = limits.atOrBelow(value, limit, hysteresis);
    const step = stepCondition(state, f.active, f.clearable, atMs, holdMs);
    state = step.state;
    if (step.change) changes.push({ atMs, change: step.change });
  }
  return { state, changes };
}

describe("an alert condition", () => {
  it("opens only once it has held for the minimum duration, counted from the first active evaluation", () => {
    const { changes } = run(
      [
        [0, 1.5],
        [1 * MIN, 1.0],
        [2 * MIN - 1, 0.8],
        [2 * MIN, 0.5],
        [3 * MIN, 0.2],
      ],
      2,
      0.5,
      2 * MIN,
    );
    expect(changes).toEqual([{ atMs: 2 * MIN, change: "raise" }]);
  });

  it("starts the wait again after one evaluation that is not active", () => {
    const { changes, state } = run(
      [
        [0, 1.5],
        [1 * MIN, 2.1],
        [2 * MIN, 1.5],
        [3 * MIN, 1.5],
      ],
      2,
      0.5,
      2 * MIN,
    );
    expect(changes).toEqual([]);
    expect(state).toMatchObject({ open: false, pendingSinceMs: 2 * MIN });
  });

  it("opens at once with no minimum duration, and remembers since when it held", () => {
    const step = stepCondition(CLOSED, true, false, 5000, 0);
    expect(step).toEqual({ state: { open: true, pendingSinceMs: null, openSinceMs: 5000 }, change: "raise" });
  });

  it("stays open inside the hysteresis and closes only past it", () => {
    const { changes } = run(
      [
        [0, 1.0], // opens (no hold)
        [1 * MIN, 2.3], // above the limit but within 0.5 K: still open
        [2 * MIN, 2.5], // exactly limit + hysteresis: still open
        [3 * MIN, 2.51], // past it: closes
      ],
      2,
      0.5,
      0,
    );
    expect(changes).toEqual([
      { atMs: 0, change: "raise" },
      { atMs: 3 * MIN, change: "clear" },
    ]);
  });

  it("does not open and close over and over for a reading flapping around the limit", () => {
    // 2 °C frost limit, 0.5 K hysteresis, 2 min minimum duration; a reading every 30 s
    // hopping between 1.9 and 2.2 °C for two hours.
    const values: [number, number][] = Array.from({ length: 240 }, (_, i) => [i * 30_000, i % 2 === 0 ? 1.9 : 2.2]);
    expect(run(values, 2, 0.5, 2 * MIN).changes).toEqual([]);
    // With no minimum duration it opens once and the hysteresis keeps it open.
    expect(run(values, 2, 0.5, 0).changes).toEqual([{ atMs: 0, change: "raise" }]);
  });

  it("keeps the limit shapes on the safe side", () => {
    expect(limits.atOrBelow(2, 2, 0.5)).toEqual({ active: true, clearable: false });
    expect(limits.atOrAbove(32, 32, 0.5)).toEqual({ active: true, clearable: false });
    expect(limits.atOrAbove(31.4, 32, 0.5)).toEqual({ active: false, clearable: true });
    // A battery exactly at its limit is not low; it is good again 5 points above it.
    expect(limits.below(15, 15, 5)).toEqual({ active: false, clearable: false });
    expect(limits.below(14.9, 15, 5)).toEqual({ active: true, clearable: false });
    expect(limits.below(20, 15, 5)).toEqual({ active: false, clearable: true });
  });
});

describe("an alert condition, for any sequence of readings", () => {
  const readings = fc.array(fc.record({ dtMs: fc.integer({ min: 0, max: 10 * MIN }), value: fc.double({ min: -2, max: 6, noNaN: true }) }), { maxLength: 200 });
  const settings = fc.record({
    limit: fc.double({ min: 0, max: 4, noNaN: true }),
    hysteresis: fc.double({ min: 0, max: 2, noNaN: true }),
    holdMs: fc.integer({ min: 0, max: 30 * MIN }),
  });

  it("raises at most once more than it clears, and never clears what it did not raise", () => {
    fc.assert(
      fc.property(readings, settings, (rs, { limit, hysteresis, holdMs }) => {
        let atMs = 0;
        const { changes } = run(
          rs.map((r) => [(atMs += r.dtMs), r.value]),
          limit,
          hysteresis,
          holdMs,
        );
        const raises = changes.filter((c) => c.change === "raise").length;
        const clears = changes.filter((c) => c.change === "clear").length;
        expect(raises).toBeLessThanOrEqual(1 + clears);
        expect(clears).toBeLessThanOrEqual(raises);
        // They alternate, starting with a raise.
        changes.forEach((c, i) => expect(c.change).toBe(i % 2 === 0 ? "raise" : "clear"));
      }),
    );
  });

  it("opens only after holdMs of active evaluations without a break, and closes only past the hysteresis", () => {
    fc.assert(
      fc.property(readings, settings, (rs, { limit, hysteresis, holdMs }) => {
        let atMs = 0;
        const timed = rs.map((r) => ({ atMs: (atMs += r.dtMs), value: r.value }));
        let state: ConditionState = CLOSED;
        for (let i = 0; i < timed.length; i++) {
          const { atMs: now, value } = timed[i]!;
          const f = limits.atOrBelow(value, limit, hysteresis);
          const step = stepCondition(state, f.active, f.clearable, now, holdMs);
          if (step.change === "raise") {
            // The run of active evaluations ending here started at least holdMs ago.
            let first = i;
            while (first > 0 && limits.atOrBelow(timed[first - 1]!.value, limit, hysteresis).active) first--;
            expect(now - timed[first]!.atMs).toBeGreaterThanOrEqual(holdMs);
            expect(value).toBeLessThanOrEqual(limit);
          }
          if (step.change === "clear") expect(value).toBeGreaterThan(limit + hysteresis);
          state = step.state;
        }
      }),
    );
  });
});
