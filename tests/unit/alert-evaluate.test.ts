// A house's alert rules applied to readings and to plugs.
import { describe, expect, it } from "vitest";
import {
  PLUG_CLOSED,
  SENSOR_CLOSED,
  evaluatePlug,
  evaluateReading,
  silenceCheck,
  type AlertChange,
  type HouseAlertContext,
  type PlugConditions,
  type PlugObservation,
  type SensorAlertContext,
  type SensorConditions,
  type SensorReading,
} from "@/lib/alerts/evaluate";
import { DEFAULT_ALERT_RULES, type AlertRules } from "@/lib/alerts/rules";

const MIN = 60_000;
const T0 = Date.parse("2026-01-10T02:00:00Z");

function house(rules: Partial<AlertRules> = {}, lowLimitC = 2): HouseAlertContext {
  return { id: "h1", name: "Long house", lowLimitC, rules: { ...DEFAULT_ALERT_RULES, ...rules } };
}
const bench = (h = house(), outside = false): SensorAlertContext => ({ id: "s1", name: "Bench sensor", outside, house: h });
const reading = (tempC: number | null, rh: number | null = 60, batteryPercent: number | null = 90): SensorReading => ({ tempC, rh, batteryPercent });

/** Feeds readings (minutes after T0) and collects the changes. */
function feed(sensor: SensorAlertContext, seq: [min: number, r: SensorReading][], start: SensorConditions = SENSOR_CLOSED) {
  let conditions = start;
  const changes: (AlertChange & { atMin: number })[] = [];
  for (const [min, r] of seq) {
    const result = evaluateReading(conditions, sensor, r, T0 + min * MIN);
    conditions = result.conditions;
    for (const c of result.changes) changes.push({ ...c, atMin: min });
  }
  return { conditions, changes };
}

describe("frost risk", () => {
  it("opens once at or below the house's frost limit after its minimum duration, naming house and sensor without figures", () => {
    const { changes } = feed(bench(), [
      [0, reading(1.8)],
      [1, reading(1.6)],
      [2, reading(1.5)],
      [3, reading(1.2)],
    ]);
    expect(changes).toHaveLength(1);
    const raised = changes[0]!;
    expect(raised).toMatchObject({ kind: "too_cold", change: "raise", atMin: 2 });
    expect(raised.change === "raise" && raised.message).toBe("Frost risk in Long house: Bench sensor is at or below the frost alert temperature.");
    expect(raised.message).not.toMatch(/\d/);
    expect(raised.change === "raise" && raised.detail).toEqual({
      valueC: 1.5,
      limitC: 2,
      hysteresisK: 0.5,
      rh: 60,
      since: new Date(T0).toISOString(),
      lastedMin: 2,
      houseName: "Long house",
      sensorName: "Bench sensor",
    });
  });

  it("uses the rule's own frost temperature over the house's limit", () => {
    const { changes } = feed(bench(house({ frost: { belowC: 4, holdMin: 0 } }, 2)), [[0, reading(3.5)]]);
    expect(changes.map((c) => c.kind)).toEqual(["too_cold"]);
  });

  it("closes only once back past the hysteresis, with a back-to-normal message and the closing reading", () => {
    const sensor = bench(house({ frost: { belowC: null, holdMin: 0 } }));
    const { changes } = feed(sensor, [
      [0, reading(1)],
      [1, reading(2.4)],
      [2, reading(1.9)],
      [3, reading(2.4)],
      [4, reading(2.6, 70)],
    ]);
    expect(changes.map((c) => [c.change, c.atMin])).toEqual([
      ["raise", 0],
      ["clear", 4],
    ]);
    const cleared = changes[1]!;
    expect(cleared.message).toBe("Bench sensor in Long house is above the frost alert temperature again.");
    expect(cleared.change === "clear" && cleared.cleared).toEqual({ at: new Date(T0 + 4 * MIN).toISOString(), valueC: 2.6, rh: 70, batteryPercent: 90 });
  });

  it("is never raised for an outside sensor, nor too warm or condensation", () => {
    const { changes } = feed(bench(house({ frost: { belowC: null, holdMin: 0 } }), true), [
      [0, reading(-5, 99)],
      [600, reading(40, 99)],
    ]);
    expect(changes).toEqual([]);
  });

  it("ignores a reading without a temperature", () => {
    const { changes, conditions } = feed(bench(), [
      [0, reading(1)],
      [1, reading(null, null, null)],
      [2, reading(1)],
    ]);
    expect(changes.map((c) => [c.kind, c.atMin])).toEqual([["too_cold", 2]]);
    expect(conditions.frost.open).toBe(true);
  });
});

describe("too warm", () => {
  it("opens at or above its temperature after its minimum duration, and is off when turned off", () => {
    const seq: [number, SensorReading][] = [
      [0, reading(32)],
      [5, reading(33)],
      [10, reading(34)],
    ];
    expect(feed(bench(), seq).changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([["too_warm", "raise", 10]]);
    expect(feed(bench(house({ tooWarm: { enabled: false, aboveC: 32, holdMin: 10 } })), seq).changes).toEqual([]);
  });

  it("closes as no longer watched when the rule is turned off while it is open", () => {
    const open = feed(bench(), [
      [0, reading(35)],
      [10, reading(35)],
    ]).conditions;
    const { changes } = feed(bench(house({ tooWarm: { enabled: false, aboveC: 32, holdMin: 10 } })), [[11, reading(35)]], open);
    expect(changes).toMatchObject([{ kind: "too_warm", change: "clear", message: "Closed: too warm is no longer watched for Bench sensor in Long house." }]);
  });
});

describe("battery low", () => {
  it("opens below the level, also for an outside sensor, and closes five points above it", () => {
    const { changes } = feed(bench(house(), true), [
      [0, reading(8, 60, 15)],
      [1, reading(8, 60, 14)],
      [2, reading(8, 60, 16)],
      [3, reading(8, 60, 19.9)],
      [4, reading(8, 60, 20)],
    ]);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([
      ["battery_low", "raise", 1],
      ["battery_low", "clear", 4],
    ]);
    expect(changes[0]!.change === "raise" && changes[0]!.detail).toMatchObject({ batteryPercent: 14, limitPercent: 15 });
  });
});

describe("condensation risk", () => {
  // Dew points by the Magnus form with Alduchov & Eskridge's (1996) coefficients, as in
  // lib/psychrometrics.ts: 10 °C at 95 % RH → 9.24 °C (within 1 K: at risk); 20 °C at
  // 50 % RH → 9.3 °C (../shared/REFERENCES.md; far from it).
  const rules = { condensation: { ...DEFAULT_ALERT_RULES.condensation, holdMin: 30 } };

  it("opens when the air stays within the margin of its dew point for the minimum duration, and says so", () => {
    const { changes } = feed(bench(house(rules)), [
      [0, reading(10, 95)],
      [15, reading(10, 95)],
      [30, reading(10, 95)],
    ]);
    expect(changes).toHaveLength(1);
    const raised = changes[0]!;
    expect(raised).toMatchObject({ kind: "condensation", change: "raise", atMin: 30 });
    expect(raised.message).toBe("Condensation risk in Long house: the air is close to its dew point at Bench sensor.");
    const detail = raised.change === "raise" ? raised.detail : {};
    expect(detail.condensation).toBe("near_dew_point");
    expect(detail.dewPointC).toBeCloseTo(9.24, 1);
    expect(detail.limitC).toBeCloseTo(10.24, 1);
  });

  it("opens when humidity stays at or above its level for the humid stretch, though the air is far from dew", () => {
    // 25 °C at 96 % RH is 0.6 K from its dew point too, so use a margin of 0 to see the humidity rule alone.
    const humid = bench(house({ condensation: { ...DEFAULT_ALERT_RULES.condensation, dewMarginK: 0, humidHours: 4 } }));
    const seq: [number, SensorReading][] = Array.from({ length: 9 }, (_, i) => [i * 30, reading(25, 96)]);
    const { changes } = feed(humid, seq);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([["condensation", "raise", 240]]);
    expect(changes[0]!.change === "raise" && changes[0]!.detail).toMatchObject({ condensation: "humid_for_hours", limitRh: 95, rh: 96 });
  });

  it("is one alert: it closes when neither condition holds, with the humidity hysteresis", () => {
    // A 0.5 K margin and 0.5 K hysteresis: the dew-point rule is clear beyond 1 K.
    const sensor = bench(house({ condensation: { ...DEFAULT_ALERT_RULES.condensation, dewMarginK: 0.5, holdMin: 0, humidHours: 0.5 } }));
    const { changes } = feed(sensor, [
      [0, reading(10, 98)], // 0.3 K from its dew point: opens
      [30, reading(10, 98)], // the humid stretch opens too: no second alert
      [31, reading(20, 93)], // 1.2 K from dew (clear of that rule), but 93 % is within the 3 % humidity hysteresis: still open
      [32, reading(20, 91.9)], // dry enough: closes
    ]);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([
      ["condensation", "raise", 0],
      ["condensation", "clear", 32],
    ]);
    expect(changes[1]!.message).toBe("The air is drier again at Bench sensor in Long house.");
  });
});

describe("sensor silence", () => {
  it("is due once the sensor has been silent for its rule's minutes, not before, and not when turned off", () => {
    const sensor = bench();
    expect(silenceCheck(sensor, T0, T0 + 15 * MIN - 1)).toBeNull();
    const raised = silenceCheck(sensor, T0, T0 + 15 * MIN);
    expect(raised).toMatchObject({ kind: "sensor_quiet", change: "raise", detail: { lastedMin: 15, since: new Date(T0).toISOString() } });
    expect(raised!.message).toBe("Bench sensor in Long house has gone silent: no reading has come in for longer than its limit.");
    expect(silenceCheck(bench(house({ sensorSilent: { enabled: false, afterMin: 15 } })), T0, T0 + 60 * MIN)).toBeNull();
  });
});

describe("plugs", () => {
  const heater = { id: "p1", name: "Bench heater", isHeater: true, refreshMs: 0, house: house() };
  const calm: PlugObservation = { offlineSinceMs: null, lastHeardMs: T0, reportedOn: true, commandedOn: true, commandedSinceMs: T0, on: true, onSinceMs: T0 };

  function watch(seq: [min: number, o: Partial<PlugObservation>][], plug = heater, ackTimeoutMs = 2000) {
    let conditions: PlugConditions = PLUG_CLOSED;
    const changes: (AlertChange & { atMin: number })[] = [];
    for (const [min, o] of seq) {
      const r = evaluatePlug(conditions, plug, { ...calm, lastHeardMs: T0 + min * MIN, ...o }, T0 + min * MIN, ackTimeoutMs);
      conditions = r.conditions;
      for (const c of r.changes) changes.push({ ...c, atMin: min });
    }
    return changes;
  }

  it("raises offline after its minutes offline or unheard, and clears when heard again", () => {
    const changes = watch([
      [0, { offlineSinceMs: T0 }],
      [4, { offlineSinceMs: T0, lastHeardMs: T0 }],
      [5, { offlineSinceMs: T0, lastHeardMs: T0 }],
      [6, {}],
      [20, { lastHeardMs: T0 + 6 * MIN }],
    ]);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([
      ["plug_offline", "raise", 5],
      ["plug_offline", "clear", 6],
      ["plug_offline", "raise", 20],
    ]);
    expect(changes[0]!.message).toBe("Bench heater in Long house is offline or has not been heard from.");
  });

  it("gives a plug that is online but quiet a third of its lease on top, as it answers a refresh that often", () => {
    const quiet = { ...heater, refreshMs: 5 * MIN };
    const changes = watch([
      [5, { lastHeardMs: T0 }],
      [9, { lastHeardMs: T0 }],
      [10, { lastHeardMs: T0 }],
    ], quiet);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([["plug_offline", "raise", 10]]);
  });

  it("raises not-as-commanded only after the acknowledgement timeout and its minutes, never for a command on its way", () => {
    // A command sent at 0 min that the plug answers within the timeout: nothing.
    expect(watch([[0, { commandedOn: false, reportedOn: true, commandedSinceMs: T0 }]], heater, 2 * MIN)).toEqual([]);
    // Wanted off since 0; the plug keeps reporting on. Past the 2 s timeout from 2 min, 3 min more.
    const stuck = { commandedOn: false, reportedOn: true, commandedSinceMs: T0 };
    const changes = watch([
      [0, stuck],
      [2, stuck],
      [4, { ...stuck, reportedOn: null }], // offline for a moment: says nothing either way
      [4.9, stuck],
      [5, stuck],
      [6, { ...stuck, reportedOn: false }],
    ]);
    expect(changes.map((c) => [c.kind, c.change, c.atMin])).toEqual([
      ["plug_mismatch", "raise", 5],
      ["plug_mismatch", "clear", 6],
    ]);
    expect(changes[0]!.change === "raise" && changes[0]!.detail).toMatchObject({ reportedOn: true, commandedOn: false, plugName: "Bench heater" });
  });

  it("raises a heater on without a break past its hours, only for heaters, and clears when it goes off", () => {
    const seq: [number, Partial<PlugObservation>][] = [
      [11 * 60, { onSinceMs: T0 }],
      [12 * 60, { onSinceMs: T0 }],
      [13 * 60, { onSinceMs: T0 }],
      [13 * 60 + 1, { on: false, reportedOn: false, commandedOn: false }],
    ];
    expect(watch(seq).map((c) => [c.kind, c.change, c.atMin])).toEqual([
      ["heater_long_on", "raise", 12 * 60],
      ["heater_long_on", "clear", 13 * 60 + 1],
    ]);
    expect(watch(seq, { ...heater, isHeater: false })).toEqual([]);
  });
});
