import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decide, type ActiveWindow, type DecisionInput, type PlugRules } from "@/lib/control";

const EPOCH_2025 = Date.UTC(2025, 0, 1);
const YEAR_MS = 365 * 24 * 3_600_000;

/** Temperatures to a tenth of a degree, as the house and window columns hold them. */
const tempC = (min = -20, max = 50) => fc.integer({ min: min * 10, max: max * 10 }).map((t) => t / 10);
const nowMs = fc.integer({ min: EPOCH_2025, max: EPOCH_2025 + YEAR_MS });

const rules: fc.Arbitrary<PlugRules> = fc.record({
  applianceKind: fc.constantFrom("heater", "fan", "light", "other"),
  applianceWatts: fc.integer({ min: 0, max: 4000 }),
  ratedCurrentA: fc.constantFrom(5, 10, 13, 15, 16),
  mainsVoltage: fc.constantFrom(110, 120, 230, 240),
  continuousLoadPercent: fc.integer({ min: 50, max: 100 }),
  highLimitC: tempC(20, 45),
  failsafe: fc.constantFrom("off", "on", "duty"),
  failsafeDutyPercent: fc.option(fc.integer({ min: 0, max: 100 })),
  failsafeDutyPeriodS: fc.integer({ min: 60, max: 3600 }),
  staleAfterS: fc.integer({ min: 60, max: 3600 }),
  outsideWindows: fc.constantFrom("off", "frost"),
  frostLowC: fc.option(tempC(0, 8), { freq: 5 }),
  frostHighC: fc.option(tempC(2, 12), { freq: 5 }),
  minOnS: fc.integer({ min: 0, max: 900 }),
  minOffS: fc.integer({ min: 0, max: 900 }),
});

const activeWindow: fc.Arbitrary<ActiveWindow> = fc.option(
  fc.record({
    window: fc.record({
      mode: fc.constantFrom("band", "on", "off"),
      lowC: fc.option(tempC(-5, 30), { freq: 8 }),
      highC: fc.option(tempC(-5, 35), { freq: 8 }),
    }),
  }),
);

const input: fc.Arbitrary<DecisionInput> = fc
  .record({
    rules,
    nowMs,
    reading: fc.option(fc.record({ tempC: fc.option(tempC(), { freq: 8 }), ageMs: fc.integer({ min: 0, max: 7_200_000 }) })),
    current: fc.option(fc.record({ on: fc.boolean(), agoMs: fc.integer({ min: 0, max: 1_800_000 }) }), { freq: 6 }),
    override: fc.option(fc.record({ id: fc.constant("o"), on: fc.boolean() }), { freq: 3 }),
    window: activeWindow,
  })
  .map(({ reading, current, ...rest }) => ({
    ...rest,
    reading: reading && { tempC: reading.tempC, atMs: rest.nowMs - reading.ageMs },
    current: current && { on: current.on, sinceMs: rest.nowMs - current.agoMs },
  }));

const isFresh = (i: DecisionInput) =>
  i.reading !== null && i.reading.tempC !== null && i.nowMs - i.reading.atMs <= i.rules.staleAfterS * 1000;

describe("decision properties", () => {
  it("(a) a heater is never wanted on at or above its high limit with a fresh reading", () => {
    const hot = fc
      .tuple(input, fc.integer({ min: 0, max: 100 }).map((d) => d / 10), fc.integer({ min: 0, max: 600_000 }))
      .map(([i, aboveC, ageMs]) => ({
        ...i,
        rules: { ...i.rules, applianceKind: "heater" as const, staleAfterS: Math.max(i.rules.staleAfterS, 600) },
        reading: { tempC: i.rules.highLimitC + aboveC, atMs: i.nowMs - ageMs },
      }));
    fc.assert(
      fc.property(hot, (i) => {
        const d = decide(i);
        expect(d.wanted).toBe(false);
        expect(d.on).toBe(false);
        expect(d.cause).toBe("safety");
        expect(d.alerts).toContain("too_hot");
      }),
    );
  });

  it("(b) no change of state sooner than the minimum on/off time, except for safety and overrides", () => {
    // A plug followed through a run of evaluations: the temperature wanders, windows and
    // overrides come and go, readings go missing; each decision is applied as the plug's state.
    const step = fc.record({
      dtMs: fc.oneof(fc.integer({ min: 1, max: 5_000 }), fc.integer({ min: 5_000, max: 240_000 })),
      driftC: tempC(-2, 2),
      readingLost: fc.integer({ min: 0, max: 4 }).map((n) => n === 0),
      override: fc.option(fc.boolean(), { freq: 6 }),
      window: activeWindow,
    });
    fc.assert(
      fc.property(rules, nowMs, tempC(-5, 40), fc.array(step, { minLength: 1, maxLength: 60 }), (r, start, startC, steps) => {
        let now = start;
        let t = startC;
        let current: DecisionInput["current"] = null;
        for (const s of steps) {
          now += s.dtMs;
          t += s.driftC;
          const d = decide({
            rules: r,
            nowMs: now,
            reading: s.readingLost ? null : { tempC: t, atMs: now },
            current,
            override: s.override === null ? null : { id: "o", on: s.override },
            window: s.window,
          });
          if (current !== null && d.on !== current.on) {
            if (d.cause !== "safety" && d.cause !== "override") {
              const heldFor = now - current.sinceMs;
              expect(heldFor).toBeGreaterThanOrEqual((current.on ? r.minOnS : r.minOffS) * 1000);
            }
          }
          if (current === null || d.on !== current.on) current = { on: d.on, sinceMs: now };
        }
      }),
    );
  });

  it("(b) near the boundary: held before the minimum time, let through from it", () => {
    const nearBoundary = fc
      .tuple(input, fc.boolean(), fc.integer({ min: -2_000, max: 2_000 }))
      .map(([i, on, offsetMs]) => {
        const minMs = (on ? i.rules.minOnS : i.rules.minOffS) * 1000;
        return { ...i, current: { on, sinceMs: i.nowMs - Math.max(0, minMs + offsetMs) } };
      });
    fc.assert(
      fc.property(nearBoundary, (i) => {
        const d = decide(i);
        const current = i.current;
        const minMs = (current.on ? i.rules.minOnS : i.rules.minOffS) * 1000;
        const early = i.nowMs - current.sinceMs < minMs;
        if (d.cause === "safety" || d.cause === "override") return;
        if (early) expect(d.on).toBe(current.on);
        else expect(d.on).toBe(d.wanted);
      }),
      { numRuns: 500 },
    );
  });

  it("(b') a held decision keeps the current state and says until when", () => {
    fc.assert(
      fc.property(input, (i) => {
        const d = decide(i);
        if (d.guardUntilMs === null) return;
        expect(i.current).not.toBeNull();
        expect(d.on).toBe(i.current!.on);
        expect(d.wanted).toBe(!d.on);
        expect(d.guardUntilMs).toBeGreaterThan(i.nowMs);
        expect(["schedule", "default", "failsafe"]).toContain(d.cause);
      }),
    );
  });

  it("(c) with a band in force and a fresh reading strictly between its edges, the state never changes", () => {
    const between = fc
      .tuple(input, tempC(-5, 30), fc.integer({ min: 2, max: 60 }), fc.double({ min: 0.01, max: 0.99, noNaN: true }), fc.boolean())
      .map(([i, lowC, widthTenths, where, inWindow]) => {
        const highC = lowC + widthTenths / 10;
        const t = lowC + (highC - lowC) * where;
        const window: ActiveWindow = inWindow
          ? { window: { mode: "band", lowC, highC } }
          : null;
        return {
          ...i,
          // Keep the safety cut-outs and the override out of the way: the band is the rule in force.
          rules: {
            ...i.rules,
            highLimitC: 60,
            applianceWatts: 1000,
            ratedCurrentA: 16,
            mainsVoltage: 230,
            outsideWindows: "frost" as const,
            frostLowC: lowC,
            frostHighC: highC,
          },
          override: null,
          window,
          reading: { tempC: t, atMs: i.nowMs },
        };
      });
    fc.assert(
      fc.property(between, (i) => {
        const d = decide(i);
        expect(d.cause).toBe(i.window === null ? "default" : "schedule");
        expect(d.on).toBe(i.current === null ? false : i.current.on);
        expect(d.guardUntilMs).toBeNull();
      }),
    );
  });

  it("(d) an overloaded plug is never on", () => {
    const overloaded = fc.tuple(input, fc.integer({ min: 1, max: 3000 })).map(([i, extraW]) => ({
      ...i,
      rules: {
        ...i.rules,
        applianceWatts: Math.ceil((i.rules.ratedCurrentA * i.rules.mainsVoltage * i.rules.continuousLoadPercent) / 100) + extraW,
      },
    }));
    fc.assert(
      fc.property(fc.oneof(overloaded, input), (i) => {
        const d = decide(i);
        const { applianceWatts: watts, mainsVoltage, ratedCurrentA, continuousLoadPercent } = i.rules;
        const current = watts / mainsVoltage;
        // Stated from the definition, not through checkLoad: over the margin's share of the rating.
        if (current > (ratedCurrentA * continuousLoadPercent) / 100) {
          expect(d.on).toBe(false);
          expect(d.cause).toBe("safety");
          expect(d.alerts).toContain("overload");
        } else {
          expect(d.alerts).not.toContain("overload");
        }
      }),
    );
  });

  it("a quiet sensor under a band always gives the fail-safe and its alert", () => {
    fc.assert(
      fc.property(input, (i) => {
        const d = decide(i);
        if (d.cause === "failsafe") {
          expect(isFresh(i)).toBe(false);
          expect(d.alerts).toContain("sensor_quiet");
          expect(d.readingTempC).toBeNull();
        }
        if (isFresh(i)) expect(d.readingTempC).toBe(i.reading!.tempC);
      }),
    );
  });

  it("the duty cycle spends its percent of every period on", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 99 }), fc.integer({ min: 60, max: 3600 }), fc.integer({ min: 0, max: 1000 }), (percent, periodS, n) => {
        const start = n * periodS * 1000;
        let onS = 0;
        for (let s = 0; s < periodS; s++) {
          const d = decide({
            rules: {
              applianceKind: "heater",
              applianceWatts: 1000,
              ratedCurrentA: 13,
              mainsVoltage: 230,
              continuousLoadPercent: 80,
              highLimitC: 35,
              failsafe: "duty",
              failsafeDutyPercent: percent,
              failsafeDutyPeriodS: periodS,
              staleAfterS: 600,
              outsideWindows: "frost",
              frostLowC: 3,
              frostHighC: 5,
              minOnS: 0,
              minOffS: 0,
            },
            nowMs: start + s * 1000,
            reading: null,
            current: null,
            override: null,
            window: null,
          });
          if (d.on) onS++;
        }
        expect(Math.abs(onS - (periodS * percent) / 100)).toBeLessThanOrEqual(1);
      }),
      { numRuns: 50 },
    );
  });
});
