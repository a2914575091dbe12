import { alertSet, OVERLOAD, SENSOR_QUIET, TOO_HOT } from "./alerts";
import { bandSenseFor, edgeReached, edgeWantsOn, type BandSense } from "./band";
import { dutyCycleOn } from "./duty";
import { checkLoad, isWithinContinuousLoad, type LoadCheck } from "./electrical";
import { guardUntil } from "./guard";
import { freshTempC } from "./sensor";
import type { Cause, Decision, DecisionInput } from "./types";

/**
 * Whether one plug should be on now, and why. Pure and synchronous; the controller
 * calls it for every plug on every evaluation.
 *
 * Precedence: safety cut-outs, then an active override, then the time window in
 * force, then the default outside windows; a band whose sensor has gone quiet gives
 * way to the plug's fail-safe. Last, the anti-short-cycle guard may hold a change back.
 *
 * Choices made here:
 * - Overrides are not held back by the guard: a phone override is meant to take
 *   effect within a second, and a person cannot switch often enough to wear a relay.
 *   The return to the schedule once the override ends is guarded as usual.
 * - Between a band's edges with the plug's state unknown, the plug goes off: the
 *   temperature is inside the band, so nothing is needed yet, and off is the cheaper
 *   state. The next edge reached switches it as usual.
 * - A band missing an edge cannot be judged, so the plug is off.
 * - A heater with no fresh reading raises "sensor_quiet" whatever rule is in force:
 *   its high-limit cut-out cannot see.
 */
export function decide(input: DecisionInput): Decision {
  const { rules, nowMs } = input;
  const tempC = freshTempC(input.reading, nowMs, rules.staleAfterS);
  const isHeater = rules.applianceKind === "heater";
  let alerts = isHeater && tempC === null ? SENSOR_QUIET : 0;

  // 1. Safety cut-outs: never held back, never argued with.
  // Written so that a NaN high limit cuts the heater out rather than letting it run.
  const tooHot = isHeater && tempC !== null && !(tempC < rules.highLimitC);
  if (tooHot) alerts |= TOO_HOT;
  if (!isWithinContinuousLoad(rules.applianceWatts, rules.mainsVoltage, rules.ratedCurrentA, rules.continuousLoadPercent)) {
    const load = checkLoad({
      watts: rules.applianceWatts,
      mainsVoltage: rules.mainsVoltage,
      ratedCurrentA: rules.ratedCurrentA,
      continuousLoadPercent: rules.continuousLoadPercent,
    });
    return result(false, "safety", false, null, overloadReason(load, rules.continuousLoadPercent), tempC, alerts | OVERLOAD);
  }
  if (tooHot) {
    return result(false, "safety", false, null, `at or above ${rules.highLimitC} °C high limit`, tempC, alerts);
  }

  // 2. Override.
  const override = input.override;
  if (override !== null) {
    return result(override.on, "override", override.on, null, override.on ? "override on" : "override off", tempC, alerts);
  }

  // 3. The time window in force, else 4. the default outside windows.
  let cause: Cause;
  let sense: BandSense;
  let lowC: number | null;
  let highC: number | null;
  let label: string;
  const active = input.window;
  if (active !== null) {
    const w = active.window;
    if (w.mode !== "band") {
      const on = w.mode === "on";
      return guarded(input, on, "schedule", on ? "window on" : "window off", tempC, alerts);
    }
    cause = "schedule";
    sense = bandSenseFor(rules.applianceKind);
    lowC = w.lowC;
    highC = w.highC;
    label = "";
  } else if (rules.outsideWindows === "frost") {
    cause = "default";
    sense = "heating";
    lowC = rules.frostLowC;
    highC = rules.frostHighC;
    label = "frost protection: ";
  } else {
    return guarded(input, false, "default", "outside windows: off", tempC, alerts);
  }

  if (lowC === null || highC === null || !Number.isFinite(lowC) || !Number.isFinite(highC)) {
    return guarded(input, false, cause, label + "band is missing an edge: off", tempC, alerts);
  }

  // 5. A band with no fresh reading to judge it by: the plug's fail-safe.
  if (tempC === null) {
    return failsafe(input, tempC, alerts | SENSOR_QUIET);
  }

  const edge = edgeReached(sense, tempC, lowC, highC);
  const reasons = bandReasons(label, lowC, highC);
  if (edge !== "between") {
    const on = edgeWantsOn(sense, edge);
    return guarded(input, on, cause, edge === "low" ? reasons.low : reasons.high, tempC, alerts);
  }
  const current = input.current;
  if (current === null) {
    return result(false, cause, false, null, reasons.unknown, tempC, alerts);
  }
  return result(current.on, cause, current.on, null, current.on ? reasons.staysOn : reasons.staysOff, tempC, alerts);
}

type BandReasons = { low: string; high: string; unknown: string; staysOn: string; staysOff: string };

// Formatting numbers into text was half the cost of a decision; a site has a handful
// of bands, so each band's sentences are made once.
const bandReasonCache = [new Map<number, Map<number, BandReasons>>(), new Map<number, Map<number, BandReasons>>()];
const MAX_CACHED_LOW_EDGES = 1000;

/** `label` is one of the two the decision uses: "" or "frost protection: ". */
function bandReasons(label: string, lowC: number, highC: number): BandReasons {
  const cache = bandReasonCache[label === "" ? 0 : 1]!;
  let byHigh = cache.get(lowC);
  if (byHigh === undefined) {
    if (cache.size >= MAX_CACHED_LOW_EDGES) cache.clear();
    byHigh = new Map();
    cache.set(lowC, byHigh);
  }
  let reasons = byHigh.get(highC);
  if (reasons === undefined) {
    const between = `${label}between ${lowC} and ${highC} °C edges`;
    reasons = {
      low: `${label}at or below ${lowC} °C low edge`,
      high: `${label}at or above ${highC} °C high edge`,
      unknown: `${between}, state unknown: off`,
      staysOn: `${between}: stays on`,
      staysOff: `${between}: stays off`,
    };
    if (byHigh.size >= MAX_CACHED_LOW_EDGES) byHigh.clear();
    byHigh.set(highC, reasons);
  }
  return reasons;
}

function failsafe(input: DecisionInput, tempC: null, alerts: number): Decision {
  const { rules } = input;
  switch (rules.failsafe) {
    case "on":
      return guarded(input, true, "failsafe", "sensor quiet: fail-safe on", tempC, alerts);
    case "duty": {
      const on = dutyCycleOn(input.nowMs, rules.failsafeDutyPercent, rules.failsafeDutyPeriodS);
      const reason = on ? "sensor quiet: fail-safe duty cycle, on part" : "sensor quiet: fail-safe duty cycle, off part";
      return guarded(input, on, "failsafe", reason, tempC, alerts);
    }
    default:
      return guarded(input, false, "failsafe", "sensor quiet: fail-safe off", tempC, alerts);
  }
}

/** Applies the anti-short-cycle guard to what the rule in force wants. */
function guarded(
  input: DecisionInput,
  wanted: boolean,
  cause: Cause,
  reason: string,
  tempC: number | null,
  alerts: number,
): Decision {
  const current = input.current;
  if (current === null || current.on === wanted) return result(wanted, cause, wanted, null, reason, tempC, alerts);
  const { rules } = input;
  const until = guardUntil(current, input.nowMs, rules.minOnS, rules.minOffS);
  if (until === null) return result(wanted, cause, wanted, null, reason, tempC, alerts);
  const waiting = current.on ? "; waiting out the minimum on time" : "; waiting out the minimum off time";
  return result(current.on, cause, wanted, until, reason + waiting, tempC, alerts);
}

function overloadReason(load: LoadCheck, percent: number): string {
  if (!Number.isFinite(load.currentA)) return "appliance current unknown (check mains voltage): kept off";
  if (!Number.isFinite(load.limitA) || !(percent > 0 && percent <= 100)) return "continuous-load margin unknown (check site settings): kept off";
  return `appliance draws ${load.currentA.toFixed(2)} A, over the plug's ${load.limitA.toFixed(1)} A continuous limit (${percent} % of its rating)`;
}

// One constructor, so every decision has the same shape.
function result(
  on: boolean,
  cause: Cause,
  wanted: boolean,
  guardUntilMs: number | null,
  reason: string,
  readingTempC: number | null,
  alerts: number,
): Decision {
  return { on, cause, wanted, guardUntilMs, reason, readingTempC, alerts: alertSet(alerts) };
}
