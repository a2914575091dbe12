import { describe, expect, it } from "vitest";
import {
  checkLoad,
  currentDrawA,
  decide,
  describeCause,
  dutyCycleOn,
  isReadingStale,
  sensorStaleAfterS,
  type ActiveWindow,
  type Decision,
  type DecisionInput,
  type PlugRules,
} from "@/lib/control";

const NOW = Date.UTC(2025, 0, 15, 6, 0, 0);
const MIN = 60_000;

// A 2 kW fan heater on a 13 A plug at 230 V, in a house with a 35 °C high limit.
const heater: PlugRules = {
  applianceKind: "heater",
  applianceWatts: 2000,
  ratedCurrentA: 13,
  mainsVoltage: 230,
  continuousLoadPercent: 80,
  highLimitC: 35,
  failsafe: "off",
  failsafeDutyPercent: null,
  failsafeDutyPeriodS: 1200,
  staleAfterS: 600,
  outsideWindows: "off",
  frostLowC: 3,
  frostHighC: 5,
  minOnS: 180,
  minOffS: 180,
};

function windowOf(mode: "band" | "on" | "off", lowC: number | null = null, highC: number | null = null): ActiveWindow {
  return {
    window: { mode, lowC, highC },
  };
}
const band = (lowC: number | null, highC: number | null) => windowOf("band", lowC, highC);
const windowOn = windowOf("on");
const windowOff = windowOf("off");

/** A reading taken a minute ago. */
const read = (tempC: number | null) => ({ tempC, atMs: NOW - MIN });
/** On or off for an hour: long past any minimum on/off time. */
const settled = (on: boolean) => ({ on, sinceMs: NOW - 60 * MIN });
const justSwitched = (on: boolean, agoMs = 10_000) => ({ on, sinceMs: NOW - agoMs });

type Case = {
  name: string;
  rules?: Partial<PlugRules>;
  nowMs?: number;
  reading?: DecisionInput["reading"];
  current?: DecisionInput["current"];
  override?: DecisionInput["override"];
  window?: ActiveWindow;
  expected: Partial<Decision>;
};

function run(c: Omit<Case, "name" | "expected">): Decision {
  return decide({
    rules: { ...heater, ...c.rules },
    nowMs: c.nowMs ?? NOW,
    reading: c.reading === undefined ? read(10) : c.reading,
    current: c.current === undefined ? settled(false) : c.current,
    override: c.override ?? null,
    window: c.window === undefined ? band(8, 12) : c.window,
  });
}

function check(c: Case) {
  const decision = run(c);
  expect(decision).toMatchObject(c.expected);
  if (c.expected.alerts === undefined) expect(decision.alerts).toEqual([]);
}

describe("safety cut-outs", () => {
  const cases: Case[] = [
    {
      name: "a heater at exactly the high limit is off, even when its band asks for heat",
      reading: read(35),
      window: band(40, 45),
      current: settled(true),
      expected: { on: false, wanted: false, cause: "safety", reason: "at or above 35 °C high limit", alerts: ["too_hot"] },
    },
    {
      name: "a heater just below the high limit follows its band",
      reading: read(34.9),
      window: band(40, 45),
      expected: { on: true, cause: "schedule" },
    },
    {
      name: "the high limit beats an override",
      reading: read(36),
      override: { id: "o1", on: true },
      expected: { on: false, cause: "safety", alerts: ["too_hot"] },
    },
    {
      name: "the high limit bypasses the minimum on time",
      reading: read(36),
      current: justSwitched(true),
      window: windowOn,
      expected: { on: false, cause: "safety", guardUntilMs: null, alerts: ["too_hot"] },
    },
    {
      name: "a stale reading cannot trip the high limit (the band falls to its fail-safe)",
      reading: { tempC: 40, atMs: NOW - 601_000 },
      rules: { failsafe: "on" },
      current: null,
      expected: { on: true, cause: "failsafe", readingTempC: null, alerts: ["sensor_quiet"] },
    },
    {
      name: "the high limit is for heaters: a fan above it keeps cooling",
      rules: { applianceKind: "fan" },
      reading: read(40),
      window: band(20, 25),
      expected: { on: true, cause: "schedule" },
    },
    {
      name: "the high limit is for heaters: lights are left alone",
      rules: { applianceKind: "light" },
      reading: read(40),
      window: windowOn,
      expected: { on: true, cause: "schedule" },
    },
    {
      name: "an overloaded plug is off, even with an override on",
      rules: { applianceWatts: 3000 },
      override: { id: "o1", on: true },
      expected: { on: false, cause: "safety", reason: "appliance draws 13.04 A, over the plug's 10.4 A continuous limit (80 % of its rating)", alerts: ["overload"] },
    },
    {
      name: "a heater within the plug's rating but over the continuous-load margin is off",
      rules: { applianceWatts: 2500 },
      window: windowOn,
      expected: { on: false, cause: "safety", reason: "appliance draws 10.87 A, over the plug's 10.4 A continuous limit (80 % of its rating)", alerts: ["overload"] },
    },
    {
      name: "the same heater runs where the site allows the full rating",
      rules: { applianceWatts: 2500, continuousLoadPercent: 100 },
      window: windowOn,
      expected: { on: true, cause: "schedule", alerts: [] },
    },
    {
      name: "a continuous-load margin that cannot be judged keeps the plug off",
      rules: { continuousLoadPercent: Number.NaN },
      window: windowOn,
      expected: { on: false, cause: "safety", reason: "continuous-load margin unknown (check site settings): kept off", alerts: ["overload"] },
    },
    {
      name: "an overloaded plug is switched off at once, minimum on time or not",
      rules: { applianceWatts: 3000 },
      current: justSwitched(true),
      window: windowOn,
      expected: { on: false, cause: "safety", guardUntilMs: null, alerts: ["overload"] },
    },
    {
      name: "an overloaded light under an on window stays off",
      rules: { applianceKind: "light", applianceWatts: 2000, mainsVoltage: 120, ratedCurrentA: 15 },
      window: windowOn,
      expected: { on: false, cause: "safety", alerts: ["overload"] },
    },
    {
      name: "an overloaded heater above the high limit raises both alerts",
      rules: { applianceWatts: 3000 },
      reading: read(36),
      expected: { on: false, cause: "safety", alerts: ["overload", "too_hot"] },
    },
    {
      name: "a plug without a mains voltage is treated as overloaded",
      rules: { mainsVoltage: 0 },
      window: windowOn,
      expected: { on: false, cause: "safety", alerts: ["overload"] },
    },
  ];
  it.each(cases)("$name", check);
});

describe("override", () => {
  const cases: Case[] = [
    {
      name: "override on beats an off window",
      window: windowOff,
      override: { id: "o1", on: true },
      expected: { on: true, wanted: true, cause: "override", reason: "override on" },
    },
    {
      name: "override off beats a band asking for heat",
      reading: read(5),
      current: settled(true),
      override: { id: "o1", on: false },
      expected: { on: false, cause: "override", reason: "override off" },
    },
    {
      name: "override beats the default outside windows",
      window: null,
      override: { id: "o1", on: true },
      expected: { on: true, cause: "override" },
    },
    {
      name: "override beats a quiet sensor's fail-safe (heater: the cut-out is blind, so alert)",
      reading: null,
      override: { id: "o1", on: true },
      expected: { on: true, cause: "override", readingTempC: null, alerts: ["sensor_quiet"] },
    },
    {
      name: "override is not held back by the minimum off time",
      current: justSwitched(false),
      override: { id: "o1", on: true },
      expected: { on: true, wanted: true, cause: "override", guardUntilMs: null },
    },
    {
      name: "override is not held back by the minimum on time",
      current: justSwitched(true),
      override: { id: "o1", on: false },
      expected: { on: false, cause: "override", guardUntilMs: null },
    },
    {
      name: "override with the plug's state unknown",
      current: null,
      override: { id: "o1", on: true },
      expected: { on: true, cause: "override" },
    },
  ];
  it.each(cases)("$name", check);
});

describe("schedule: heating band (heater, light, other)", () => {
  const kinds = ["heater", "light", "other"] as const;
  const rows: [tempC: number, current: DecisionInput["current"], on: boolean, reason: string][] = [
    [8, settled(false), true, "at or below 8 °C low edge"],
    [7.2, settled(false), true, "at or below 8 °C low edge"],
    [8, settled(true), true, "at or below 8 °C low edge"],
    [12, settled(true), false, "at or above 12 °C high edge"],
    [13.5, settled(true), false, "at or above 12 °C high edge"],
    [8.1, settled(false), false, "between 8 and 12 °C edges: stays off"],
    [10, settled(false), false, "between 8 and 12 °C edges: stays off"],
    [10, settled(true), true, "between 8 and 12 °C edges: stays on"],
    [11.9, settled(true), true, "between 8 and 12 °C edges: stays on"],
    [10, null, false, "between 8 and 12 °C edges, state unknown: off"],
    [8, null, true, "at or below 8 °C low edge"],
  ];
  const cases = kinds.flatMap((kind) =>
    rows.map(([tempC, current, on, reason]) => ({
      name: `${kind} at ${tempC} °C, ${current === null ? "state unknown" : current.on ? "on" : "off"} → ${on ? "on" : "off"}`,
      rules: { applianceKind: kind },
      reading: read(tempC),
      current,
      expected: { on, wanted: on, cause: "schedule" as const, reason, readingTempC: tempC, guardUntilMs: null },
    })),
  );
  it.each(cases)("$name", check);
});

describe("schedule: a fan's band means cooling", () => {
  const rows: [tempC: number, current: DecisionInput["current"], on: boolean, reason: string][] = [
    [25, settled(false), true, "at or above 25 °C high edge"],
    [27, settled(false), true, "at or above 25 °C high edge"],
    [20, settled(true), false, "at or below 20 °C low edge"],
    [18, settled(true), false, "at or below 20 °C low edge"],
    [22, settled(true), true, "between 20 and 25 °C edges: stays on"],
    [22, settled(false), false, "between 20 and 25 °C edges: stays off"],
    [22, null, false, "between 20 and 25 °C edges, state unknown: off"],
  ];
  const cases = rows.map(([tempC, current, on, reason]) => ({
    name: `fan at ${tempC} °C, ${current === null ? "state unknown" : current.on ? "on" : "off"} → ${on ? "on" : "off"}`,
    rules: { applianceKind: "fan" as const },
    window: band(20, 25),
    reading: read(tempC),
    current,
    expected: { on, cause: "schedule" as const, reason },
  }));
  it.each(cases)("$name", check);
});

describe("schedule: plain on/off windows and odd bands", () => {
  const cases: Case[] = [
    { name: "an on window switches on", window: windowOn, expected: { on: true, cause: "schedule", reason: "window on" } },
    {
      name: "an off window switches off",
      window: windowOff,
      current: settled(true),
      expected: { on: false, cause: "schedule", reason: "window off" },
    },
    {
      name: "an on window ignores the temperature (light)",
      rules: { applianceKind: "light" },
      reading: read(30),
      window: windowOn,
      expected: { on: true, cause: "schedule" },
    },
    {
      name: "a quiet sensor does not touch an on window (light: no alert)",
      rules: { applianceKind: "light" },
      reading: null,
      window: windowOn,
      expected: { on: true, cause: "schedule" },
    },
    {
      name: "a quiet sensor does not touch an off window (heater: alert, its cut-out is blind)",
      reading: null,
      window: windowOff,
      rules: { failsafe: "on" },
      expected: { on: false, cause: "schedule", alerts: ["sensor_quiet"] },
    },
    {
      name: "a heating band with overlapping edges errs to off",
      reading: read(10),
      window: band(12, 8),
      current: settled(true),
      expected: { on: false, cause: "schedule", reason: "at or above 8 °C high edge" },
    },
    {
      name: "a cooling band with overlapping edges errs to off",
      rules: { applianceKind: "fan" },
      reading: read(22),
      window: band(25, 20),
      current: settled(true),
      expected: { on: false, cause: "schedule", reason: "at or below 25 °C low edge" },
    },
    {
      name: "a band missing its low edge is off",
      window: band(null, 12),
      current: settled(true),
      expected: { on: false, cause: "schedule", reason: "band is missing an edge: off" },
    },
    {
      name: "a band missing its high edge is off, even with a quiet sensor",
      window: band(8, null),
      reading: null,
      rules: { failsafe: "on" },
      expected: { on: false, cause: "schedule", alerts: ["sensor_quiet"] },
    },
  ];
  it.each(cases)("$name", check);
});

describe("default outside windows", () => {
  const frost = { outsideWindows: "frost" as const, frostLowC: 3, frostHighC: 5 };
  const cases: Case[] = [
    {
      name: "off by default",
      window: null,
      current: settled(true),
      reading: read(-5),
      expected: { on: false, cause: "default", reason: "outside windows: off" },
    },
    {
      name: "off by default is not a band: a quiet sensor changes nothing (light)",
      rules: { applianceKind: "light", failsafe: "on" },
      window: null,
      reading: null,
      expected: { on: false, cause: "default" },
    },
    {
      name: "frost protection: on at the low edge",
      rules: frost,
      window: null,
      reading: read(3),
      expected: { on: true, cause: "default", reason: "frost protection: at or below 3 °C low edge" },
    },
    {
      name: "frost protection: off at the high edge",
      rules: frost,
      window: null,
      reading: read(5),
      current: settled(true),
      expected: { on: false, cause: "default", reason: "frost protection: at or above 5 °C high edge" },
    },
    {
      name: "frost protection: between the edges keeps heating",
      rules: frost,
      window: null,
      reading: read(4),
      current: settled(true),
      expected: { on: true, cause: "default", reason: "frost protection: between 3 and 5 °C edges: stays on" },
    },
    {
      name: "frost protection uses heating sense even for a fan",
      rules: { ...frost, applianceKind: "fan" },
      window: null,
      reading: read(2),
      expected: { on: true, cause: "default" },
    },
    {
      name: "frost protection with no edges set is off",
      rules: { ...frost, frostLowC: null },
      window: null,
      reading: read(-2),
      expected: { on: false, cause: "default", reason: "frost protection: band is missing an edge: off" },
    },
    {
      name: "frost protection with a quiet sensor goes to the fail-safe",
      rules: { ...frost, failsafe: "on" },
      window: null,
      reading: null,
      expected: { on: true, cause: "failsafe", alerts: ["sensor_quiet"] },
    },
    {
      name: "a window in force wins over frost protection",
      rules: frost,
      window: windowOff,
      reading: read(-2),
      expected: { on: false, cause: "schedule" },
    },
  ];
  it.each(cases)("$name", check);
});

describe("stale sensor → fail-safe", () => {
  const quiet = { cause: "failsafe" as const, readingTempC: null, alerts: ["sensor_quiet" as const] };
  const cases: Case[] = [
    {
      name: "no reading at all",
      reading: null,
      rules: { failsafe: "on" },
      expected: { on: true, ...quiet, reason: "sensor quiet: fail-safe on" },
    },
    { name: "a reading with no temperature", reading: read(null), rules: { failsafe: "on" }, expected: { on: true, ...quiet } },
    { name: "a reading of NaN", reading: read(NaN), rules: { failsafe: "on" }, expected: { on: true, ...quiet } },
    {
      name: "a reading a millisecond past the stale limit",
      reading: { tempC: 10, atMs: NOW - 600_001 },
      rules: { failsafe: "on" },
      expected: { on: true, ...quiet },
    },
    {
      name: "a reading exactly at the stale limit still counts",
      reading: { tempC: 10, atMs: NOW - 600_000 },
      rules: { failsafe: "on" },
      expected: { on: false, cause: "schedule", readingTempC: 10 },
    },
    {
      name: "fail-safe off beats a band that would keep heating",
      reading: null,
      current: settled(true),
      expected: { on: false, ...quiet, reason: "sensor quiet: fail-safe off" },
    },
    {
      name: "fail-safe on for a fan (no cut-out involved, the alert is for the band)",
      rules: { applianceKind: "fan", failsafe: "on" },
      window: band(20, 25),
      reading: null,
      expected: { on: true, ...quiet },
    },
    {
      name: "fail-safe is held back by the minimum on time",
      reading: null,
      current: justSwitched(true, 60_000),
      expected: { on: true, wanted: false, cause: "failsafe", guardUntilMs: NOW + 120_000, alerts: ["sensor_quiet"] },
    },
  ];
  it.each(cases)("$name", check);
});

describe("fail-safe duty cycle: on for the first percent of each period, aligned to the epoch", () => {
  // Midnight UTC is a whole number of 1200 s periods since the epoch.
  const PERIOD_START = Date.UTC(2025, 0, 15);
  const rows: [offsetMs: number, percent: number | null, periodS: number, on: boolean][] = [
    [0, 25, 1200, true],
    [299_999, 25, 1200, true],
    [300_000, 25, 1200, false],
    [1_199_999, 25, 1200, false],
    [1_200_000, 25, 1200, true],
    [1_500_000, 25, 1200, false],
    [6 * 3_600_000 + 100_000, 25, 1200, true],
    [0, 0, 1200, false],
    [0, null, 1200, false],
    [1_199_999, 100, 1200, true],
    [0, 50, 0, false],
    [899_999, 50, 1800, true],
    [900_000, 50, 1800, false],
  ];
  const cases = rows.map(([offsetMs, percent, periodS, on]) => ({
    name: `${percent} % of ${periodS} s at +${offsetMs} ms → ${on ? "on" : "off"}`,
    nowMs: PERIOD_START + offsetMs,
    rules: { failsafe: "duty" as const, failsafeDutyPercent: percent, failsafeDutyPeriodS: periodS },
    reading: null,
    current: null,
    expected: {
      on,
      cause: "failsafe" as const,
      reason: on ? "sensor quiet: fail-safe duty cycle, on part" : "sensor quiet: fail-safe duty cycle, off part",
      alerts: ["sensor_quiet" as const],
    },
  }));
  it.each(cases)("$name", check);

  it("agrees before the epoch too", () => {
    expect(dutyCycleOn(-1, 25, 1200)).toBe(false);
    expect(dutyCycleOn(-1_200_000, 25, 1200)).toBe(true);
    expect(dutyCycleOn(-900_001, 25, 1200)).toBe(true);
  });
});

describe("anti-short-cycle guard", () => {
  const rules = { minOnS: 180, minOffS: 60 };
  const cases: Case[] = [
    {
      name: "on for 179.999 s of 180: the switch-off is held",
      rules,
      window: windowOff,
      current: justSwitched(true, 179_999),
      expected: {
        on: true,
        wanted: false,
        cause: "schedule",
        guardUntilMs: NOW + 1,
        reason: "window off; waiting out the minimum on time",
      },
    },
    {
      name: "on for exactly 180 s: the switch-off goes through",
      rules,
      window: windowOff,
      current: justSwitched(true, 180_000),
      expected: { on: false, wanted: false, guardUntilMs: null, reason: "window off" },
    },
    {
      name: "off for 59.999 s of 60: the switch-on is held (the minimum off time, not on)",
      rules,
      reading: read(7),
      current: justSwitched(false, 59_999),
      expected: {
        on: false,
        wanted: true,
        guardUntilMs: NOW + 1,
        reason: "at or below 8 °C low edge; waiting out the minimum off time",
      },
    },
    {
      name: "off for exactly 60 s: the switch-on goes through",
      rules,
      reading: read(7),
      current: justSwitched(false, 60_000),
      expected: { on: true, wanted: true, guardUntilMs: null },
    },
    {
      name: "no change wanted: nothing to hold",
      rules,
      window: windowOn,
      current: justSwitched(true, 1_000),
      expected: { on: true, guardUntilMs: null },
    },
    {
      name: "state unknown: no guard",
      rules,
      window: windowOn,
      current: null,
      expected: { on: true, guardUntilMs: null },
    },
    {
      name: "the default outside windows is guarded too",
      rules,
      window: null,
      current: justSwitched(true, 30_000),
      expected: { on: true, wanted: false, cause: "default", guardUntilMs: NOW + 150_000 },
    },
    {
      name: "a last change stamped in the future (clock skew) holds until its own minimum",
      rules,
      window: windowOff,
      current: { on: true, sinceMs: NOW + 5_000 },
      expected: { on: true, guardUntilMs: NOW + 185_000 },
    },
    {
      name: "no minimum set: changes go straight through",
      rules: { minOnS: 0, minOffS: 0 },
      window: windowOff,
      current: justSwitched(true, 0),
      expected: { on: false, guardUntilMs: null },
    },
  ];
  it.each(cases)("$name", check);
});

describe("describeCause", () => {
  it.each([
    [{ cause: "schedule", reason: "at or below 8 °C low edge" }, "Schedule: at or below 8 °C low edge"],
    [{ cause: "default", reason: "outside windows: off" }, "Outside time windows: outside windows: off"],
    [{ cause: "failsafe", reason: "sensor quiet: fail-safe on" }, "Quiet-sensor fail-safe: sensor quiet: fail-safe on"],
    [{ cause: "safety", reason: "at or above 35 °C high limit" }, "Safety cut-out: at or above 35 °C high limit"],
    [{ cause: "override", reason: "override on" }, "Manual override: override on"],
  ] as const)("%o → %s", (decision, text) => {
    expect(describeCause(decision)).toBe(text);
  });
});

describe("reference checks", () => {
  // I = P / V and socket ratings: REFERENCES.md "Electrical" (2 kW at 230 V ≈ 8.7 A;
  // at 120 V ≈ 16.7 A; BS 1363 13 A; NEMA 5-15 15 A at 120 V; Schuko CEE 7/7 16 A).
  // The 80 % limit for continuous loads (space heating counts): NEC 210.19(A)/210.20(A),
  // the 125 % rule, as REFERENCES.md "Electrical" gives it.
  it.each([
    { watts: 2000, volts: 120, ratedA: 15, plug: "NEMA 5-15", amps: 16.7, limitA: 12, within: false },
    { watts: 1600, volts: 120, ratedA: 15, plug: "NEMA 5-15", amps: 13.3, limitA: 12, within: false },
    { watts: 2000, volts: 230, ratedA: 13, plug: "BS 1363", amps: 8.7, limitA: 10.4, within: true },
    { watts: 3000, volts: 230, ratedA: 13, plug: "BS 1363", amps: 13.0, limitA: 10.4, within: false },
    // Derived from the same rule: 3 kW on a 16 A Schuko plug (13.0 A against 12.8 A).
    { watts: 3000, volts: 230, ratedA: 16, plug: "Schuko CEE 7/7", amps: 13.0, limitA: 12.8, within: false },
    // Derived: 80 % of 16 A × 230 V = 2944 W draws exactly the limit, which is within it.
    { watts: 2944, volts: 230, ratedA: 16, plug: "Schuko CEE 7/7", amps: 12.8, limitA: 12.8, within: true },
  ])("$watts W at $volts V ≈ $amps A on a $ratedA A $plug plug: continuous limit $limitA A, within $within", (r) => {
    expect(currentDrawA(r.watts, r.volts)).toBeCloseTo(r.amps, 1);
    const load = checkLoad({ watts: r.watts, mainsVoltage: r.volts, ratedCurrentA: r.ratedA, continuousLoadPercent: 80 });
    expect(load.currentA).toBeCloseTo(r.amps, 1);
    expect(load.limitA).toBeCloseTo(r.limitA, 6);
    expect(load.withinLimit).toBe(r.within);
    const decision = run({
      rules: { applianceWatts: r.watts, mainsVoltage: r.volts, ratedCurrentA: r.ratedA, continuousLoadPercent: 80 },
      window: windowOn,
    });
    expect(decision.on).toBe(r.within);
    expect(decision.alerts.includes("overload")).toBe(!r.within);
  });

  it("the load check refuses what it cannot judge", () => {
    const base = { watts: 1000, mainsVoltage: 230, ratedCurrentA: 13, continuousLoadPercent: 80 };
    expect(checkLoad(base).withinLimit).toBe(true);
    expect(checkLoad({ ...base, mainsVoltage: 0 }).withinLimit).toBe(false);
    expect(checkLoad({ ...base, watts: Number.NaN }).withinLimit).toBe(false);
    expect(checkLoad({ ...base, continuousLoadPercent: 0 }).withinLimit).toBe(false);
    expect(checkLoad({ ...base, continuousLoadPercent: 120 }).withinLimit).toBe(false);
    expect(checkLoad({ ...base, ratedCurrentA: Number.NaN }).withinLimit).toBe(false);
  });

  // On/off heating: off at the high edge, on at the low edge, the gap between is the
  // differential — REFERENCES.md "Thermostats" (the textbook definition; it names no
  // publication). The 1.5 °C differential and 3 min minimum on/off time are common
  // practice, no published source (REFERENCES.md says so).
  it("a heater with a 1.5 °C differential switches on at the low edge, off at the high edge, and keeps its state between", () => {
    const rules: PlugRules = { ...heater, minOnS: 180, minOffS: 180 };
    const low = 10;
    const high = 11.5;
    const temps = [11, 10.4, 10, 10.2, 10.8, 11.4, 11.5, 11.2, 10.6, 10.1, 10];
    let current: { on: boolean; sinceMs: number } = { on: false, sinceMs: NOW - 3_600_000 };
    const states: boolean[] = [];
    temps.forEach((tempC, i) => {
      const nowMs = NOW + i * 5 * MIN;
      const d = decide({ rules, nowMs, reading: { tempC, atMs: nowMs }, current, override: null, window: band(low, high) });
      if (d.on !== current.on) current = { on: d.on, sinceMs: nowMs };
      states.push(d.on);
    });
    expect(states).toEqual([false, false, true, true, true, true, false, false, false, false, true]);
  });

  // Frost protection around 2–5 °C: REFERENCES.md "Thermostats", common practice, no published source.
  it("frost protection at 3–5 °C keeps a house from freezing at -1 °C and lets it be at 6 °C", () => {
    const rules: PlugRules = { ...heater, outsideWindows: "frost", frostLowC: 3, frostHighC: 5 };
    const at = (tempC: number) =>
      decide({ rules, nowMs: NOW, reading: read(tempC), current: settled(false), override: null, window: null });
    expect(at(-1).on).toBe(true);
    expect(at(6).on).toBe(false);
  });
});

describe("reading staleness, one rule for the decision and the pages", () => {
  it("a reading exactly at the limit is fresh, a millisecond later it is stale, and NaN is stale", () => {
    expect(isReadingStale(NOW - 600_000, NOW, 600)).toBe(false);
    expect(isReadingStale(NOW - 600_001, NOW, 600)).toBe(true);
    expect(isReadingStale(Number.NaN, NOW, 600)).toBe(true);
    expect(isReadingStale(NOW, NOW, Number.NaN)).toBe(true);
  });

  it("a sensor is judged by the strictest plug that follows it, else the plugs' default", () => {
    expect(sensorStaleAfterS([900, 300, 600])).toBe(300);
    expect(sensorStaleAfterS([])).toBe(600);
  });

  it("the decision falls to the fail-safe exactly when the page calls the reading stale", () => {
    for (const ageMs of [0, 599_999, 600_000, 600_001, 3_600_000]) {
      const d = run({ reading: { tempC: 10, atMs: NOW - ageMs }, rules: { failsafe: "on" } });
      expect(d.cause === "failsafe").toBe(isReadingStale(NOW - ageMs, NOW, heater.staleAfterS));
    }
  });
});
