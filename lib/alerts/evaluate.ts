// A house's alert rules (lib/alerts/rules.ts) applied to what the controller hears:
// each sensor reading as it arrives, and on the controller's tick what only time shows
// (a sensor gone silent, a plug offline, a plug not as commanded, a heater on too long).
// Pure: the controller keeps the condition states and stores the changes. Evaluating a
// reading touches only its own sensor's states: O(1) per reading.
//
// Which rule applies where:
// - inside sensors: frost risk (too_cold; cannot be turned off), too warm, battery low,
//   condensation (the air within dewMarginK of its dew point for holdMin, or humidity at
//   or above humidAboveRh for humidHours: one alert, the detail says which opened it);
// - outside sensors: battery low and silence only; an outside reading says nothing
//   about a house's plants;
// - plugs: offline, not as commanded, and (heaters) on without a break too long.
import { dewPointC } from "@/lib/psychrometrics";
import { CLOSED, limits, stepCondition, type ConditionChange, type ConditionState, type Flags } from "./conditions";
import type { AlertDetail } from "./detail";
import { BATTERY_HYSTERESIS_PERCENT, frostAlertC, type AlertRules } from "./rules";
import { ruleWording, type Named } from "./rule-wording";

export type RuleAlertKind = "too_cold" | "too_warm" | "battery_low" | "condensation" | "sensor_quiet" | "plug_offline" | "plug_mismatch" | "heater_long_on";

export type HouseAlertContext = { id: string; name: string; lowLimitC: number; rules: AlertRules };
export type SensorAlertContext = { id: string; name: string; outside: boolean; house: HouseAlertContext };
export type PlugAlertContext = {
  id: string;
  name: string;
  isHeater: boolean;
  /**
   * A plug left alone is sent its state again every third of its lease and answers
   * each time, so "not heard from" waits that long on top of the rule's minutes before
   * it counts as offline; a plug's own "offline" (its last will) counts at once.
   */
  refreshMs: number;
  house: HouseAlertContext;
};

export type ClearedDetail = NonNullable<AlertDetail["cleared"]>;
export type AlertChange =
  | { kind: RuleAlertKind; change: "raise"; message: string; detail: AlertDetail }
  | { kind: RuleAlertKind; change: "clear"; message: string; cleared: ClearedDetail };

const NO_CHANGES: readonly AlertChange[] = Object.freeze([]);
const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places;
const iso = (ms: number) => new Date(ms).toISOString();
const lasted = (sinceMs: number | null, nowMs: number) => (sinceMs === null ? undefined : round((nowMs - sinceMs) / MINUTE_MS, 1));
const named = (subject: { name: string; house: HouseAlertContext }): Named => ({ name: subject.name, houseName: subject.house.name });

type Tracked = { state: ConditionState; change: ConditionChange | "off" };

/**
 * One condition, with its rule on or off. A rule turned off (or no longer applying)
 * closes an open alert as "no longer watched"; missing input (`flags` null) changes nothing.
 */
function track(state: ConditionState, enabled: boolean, flags: Flags | null, nowMs: number, holdMs: number): Tracked {
  if (!enabled) return { state: CLOSED, change: state.open ? "off" : null };
  if (flags === null) return { state, change: null };
  return stepCondition(state, flags.active, flags.clearable, nowMs, holdMs);
}

/** Turns a tracked condition's change into the alert change it makes (the raise built only when needed). */
function changesOf(changes: AlertChange[], who: Named, cleared: ClearedDetail) {
  return (kind: RuleAlertKind, t: Tracked, raised: () => { message: string; detail: AlertDetail }, clearedMessage: string) => {
    if (t.change === "raise") changes.push({ kind, change: "raise", ...raised() });
    else if (t.change === "clear") changes.push({ kind, change: "clear", message: clearedMessage, cleared });
    else if (t.change === "off") changes.push({ kind, change: "clear", message: ruleWording.noLongerWatched(kind, who), cleared });
  };
}

// ---------------------------------------------------------------------------------
// Sensor readings

export type SensorConditions = {
  readonly frost: ConditionState;
  readonly warm: ConditionState;
  readonly battery: ConditionState;
  readonly dew: ConditionState;
  readonly humid: ConditionState;
};

export const SENSOR_CLOSED: SensorConditions = Object.freeze({ frost: CLOSED, warm: CLOSED, battery: CLOSED, dew: CLOSED, humid: CLOSED });

/** A reading as the rules take it: battery as a percentage (the MQTT payload's 0..1 × 100). */
export type SensorReading = { tempC: number | null; rh: number | null; batteryPercent: number | null };

export type SensorEvaluation = { conditions: SensorConditions; changes: readonly AlertChange[] };

/** Takes one reading of one sensor through its house's rules. */
export function evaluateReading(conditions: SensorConditions, sensor: SensorAlertContext, reading: SensorReading, nowMs: number): SensorEvaluation {
  const rules = sensor.house.rules;
  const inside = !sensor.outside;
  const { tempC, rh, batteryPercent } = reading;
  const hystK = rules.hysteresisK;
  const frostC = frostAlertC(rules, sensor.house.lowLimitC);
  const dewC = tempC === null ? null : dewPointC(tempC, rh);

  const frost = track(conditions.frost, inside, tempC === null ? null : limits.atOrBelow(tempC, frostC, hystK), nowMs, rules.frost.holdMin * MINUTE_MS);
  const warm = track(conditions.warm, inside && rules.tooWarm.enabled, tempC === null ? null : limits.atOrAbove(tempC, rules.tooWarm.aboveC, hystK), nowMs, rules.tooWarm.holdMin * MINUTE_MS);
  const battery = track(
    conditions.battery,
    rules.batteryLow.enabled,
    batteryPercent === null ? null : limits.below(batteryPercent, rules.batteryLow.belowPercent, BATTERY_HYSTERESIS_PERCENT),
    nowMs,
    0,
  );
  const c = rules.condensation;
  const condensationOn = inside && c.enabled;
  const dew = track(conditions.dew, condensationOn, dewC === null ? null : limits.atOrBelow(tempC! - dewC, c.dewMarginK, hystK), nowMs, c.holdMin * MINUTE_MS);
  const humid = track(conditions.humid, condensationOn, rh === null ? null : limits.atOrAbove(rh, c.humidAboveRh, c.hysteresisRh), nowMs, c.humidHours * HOUR_MS);

  const next: SensorConditions =
    frost.state === conditions.frost && warm.state === conditions.warm && battery.state === conditions.battery && dew.state === conditions.dew && humid.state === conditions.humid
      ? conditions
      : { frost: frost.state, warm: warm.state, battery: battery.state, dew: dew.state, humid: humid.state };
  if (frost.change === null && warm.change === null && battery.change === null && dew.change === null && humid.change === null) {
    return { conditions: next, changes: NO_CHANGES };
  }

  const who = named(sensor);
  const names = { houseName: sensor.house.name, sensorName: sensor.name };
  const cleared: ClearedDetail = { at: iso(nowMs) };
  if (tempC !== null) cleared.valueC = tempC;
  if (rh !== null) cleared.rh = rh;
  if (batteryPercent !== null) cleared.batteryPercent = batteryPercent;
  const withRh = rh === null ? {} : { rh };
  const changes: AlertChange[] = [];
  const follow = changesOf(changes, who, cleared);

  follow(
    "too_cold",
    frost,
    () => ({
      message: ruleWording.frostRaised(who),
      detail: { valueC: tempC!, limitC: frostC, hysteresisK: hystK, ...withRh, ...since(frost.state, nowMs), ...names },
    }),
    ruleWording.frostCleared(who),
  );
  follow(
    "too_warm",
    warm,
    () => ({
      message: ruleWording.warmRaised(who),
      detail: { valueC: tempC!, limitC: rules.tooWarm.aboveC, hysteresisK: hystK, ...withRh, ...since(warm.state, nowMs), ...names },
    }),
    ruleWording.warmCleared(who),
  );
  follow(
    "battery_low",
    battery,
    () => ({ message: ruleWording.batteryRaised(who), detail: { batteryPercent: batteryPercent!, limitPercent: rules.batteryLow.belowPercent, ...names } }),
    ruleWording.batteryCleared(who),
  );

  // Condensation is one alert: open while either of its conditions is.
  const wasOpen = conditions.dew.open || conditions.humid.open;
  const isOpen = dew.state.open || humid.state.open;
  if (!wasOpen && isOpen) {
    const nearDew = dew.state.open;
    const opened = nearDew ? dew.state : humid.state;
    changes.push({
      kind: "condensation",
      change: "raise",
      message: nearDew ? ruleWording.dewRaised(who) : ruleWording.humidRaised(who),
      detail: {
        condensation: nearDew ? "near_dew_point" : "humid_for_hours",
        ...(tempC === null ? {} : { valueC: tempC }),
        ...(dewC === null ? {} : { dewPointC: round(dewC, 2) }),
        ...(nearDew ? { limitC: round(dewC! + c.dewMarginK, 2), hysteresisK: hystK } : { limitRh: c.humidAboveRh }),
        ...withRh,
        ...since(opened, nowMs),
        ...names,
      },
    });
  } else if (wasOpen && !isOpen) {
    const off = dew.change === "off" || humid.change === "off";
    changes.push({ kind: "condensation", change: "clear", message: off ? ruleWording.noLongerWatched("condensation", who) : ruleWording.condensationCleared(who), cleared });
  }
  return { conditions: next, changes: changes.length ? changes : NO_CHANGES };
}

function since(state: ConditionState, nowMs: number): Pick<AlertDetail, "since" | "lastedMin"> {
  return state.openSinceMs === null ? {} : { since: iso(state.openSinceMs), lastedMin: lasted(state.openSinceMs, nowMs) };
}

// ---------------------------------------------------------------------------------
// Sensor silence. It opens on the tick and closes on the next reading with a
// temperature; it is the same alert as the decision's quiet-sensor fail-safe (one per
// sensor, whichever notices first), so it keeps no condition state of its own here.

/** A raise when the sensor has been silent past its rule's limit, else null. */
export function silenceCheck(sensor: SensorAlertContext, lastHeardMs: number, nowMs: number): AlertChange | null {
  const rule = sensor.house.rules.sensorSilent;
  if (!rule.enabled || nowMs - lastHeardMs < rule.afterMin * MINUTE_MS) return null;
  return {
    kind: "sensor_quiet",
    change: "raise",
    message: ruleWording.silentRaised(named(sensor)),
    detail: { since: iso(lastHeardMs), lastedMin: lasted(lastHeardMs, nowMs), houseName: sensor.house.name, sensorName: sensor.name },
  };
}

/** The close of a silence alert by a reading. */
export function silenceEnded(sensor: SensorAlertContext, reading: SensorReading, nowMs: number): AlertChange {
  const cleared: ClearedDetail = { at: iso(nowMs) };
  if (reading.tempC !== null) cleared.valueC = reading.tempC;
  return { kind: "sensor_quiet", change: "clear", message: ruleWording.silentCleared(named(sensor)), cleared };
}

// ---------------------------------------------------------------------------------
// Plugs, on the tick

export type PlugConditions = { readonly offline: ConditionState; readonly mismatch: ConditionState; readonly longOn: ConditionState };

export const PLUG_CLOSED: PlugConditions = Object.freeze({ offline: CLOSED, mismatch: CLOSED, longOn: CLOSED });

/** What the controller knows of a plug at a tick. */
export type PlugObservation = {
  /** Its presence says offline since then (null: online, or not said). */
  offlineSinceMs: number | null;
  /** Its last report or "online" (the controller's start if not heard since). */
  lastHeardMs: number;
  /** The state its last report gave; null while offline or not heard. */
  reportedOn: boolean | null;
  /** The state the controller has last commanded (its latest decision), and since when it has wanted it. */
  commandedOn: boolean | null;
  commandedSinceMs: number;
  /** The switch log's state and since when (confirmed switches and observed changes). */
  on: boolean | null;
  onSinceMs: number;
};

export type PlugEvaluation = { conditions: PlugConditions; changes: readonly AlertChange[] };

/**
 * The plug's time-based rules. A plug is "not as commanded" when its report differs
 * from the state the controller has wanted for longer than the acknowledgement
 * timeout (a command simply on its way does not count), for the rule's minutes.
 */
export function evaluatePlug(conditions: PlugConditions, plug: PlugAlertContext, o: PlugObservation, nowMs: number, ackTimeoutMs: number): PlugEvaluation {
  const rules = plug.house.rules;
  const offlineMs = rules.plugOffline.afterMin * MINUTE_MS;
  const quietSinceMs = o.offlineSinceMs ?? o.lastHeardMs;
  const offline = track(
    conditions.offline,
    rules.plugOffline.enabled,
    {
      active: o.offlineSinceMs !== null ? nowMs - o.offlineSinceMs >= offlineMs : nowMs - o.lastHeardMs >= offlineMs + plug.refreshMs,
      clearable: o.offlineSinceMs === null && nowMs - o.lastHeardMs < offlineMs + plug.refreshMs,
    },
    nowMs,
    0,
  );
  const comparable = o.reportedOn !== null && o.commandedOn !== null;
  const mismatch = track(
    conditions.mismatch,
    rules.plugMismatch.enabled,
    comparable ? { active: o.reportedOn !== o.commandedOn && nowMs - o.commandedSinceMs >= ackTimeoutMs, clearable: o.reportedOn === o.commandedOn } : null,
    nowMs,
    rules.plugMismatch.afterMin * MINUTE_MS,
  );
  const longOn = track(
    conditions.longOn,
    plug.isHeater && rules.heaterLongOn.enabled,
    { active: o.on === true && nowMs - o.onSinceMs >= rules.heaterLongOn.afterHours * HOUR_MS, clearable: o.on === false },
    nowMs,
    0,
  );
  const next: PlugConditions =
    offline.state === conditions.offline && mismatch.state === conditions.mismatch && longOn.state === conditions.longOn
      ? conditions
      : { offline: offline.state, mismatch: mismatch.state, longOn: longOn.state };
  if (offline.change === null && mismatch.change === null && longOn.change === null) return { conditions: next, changes: NO_CHANGES };

  const who = named(plug);
  const names = { houseName: plug.house.name, plugName: plug.name };
  const changes: AlertChange[] = [];
  const follow = changesOf(changes, who, { at: iso(nowMs) });
  follow(
    "plug_offline",
    offline,
    () => ({ message: ruleWording.offlineRaised(who), detail: { since: iso(quietSinceMs), lastedMin: lasted(quietSinceMs, nowMs), ...names } }),
    ruleWording.offlineCleared(who),
  );
  follow(
    "plug_mismatch",
    mismatch,
    () => ({
      message: ruleWording.mismatchRaised(who),
      detail: { reportedOn: o.reportedOn!, commandedOn: o.commandedOn!, ...since(mismatch.state, nowMs), ...names },
    }),
    ruleWording.mismatchCleared(who),
  );
  follow(
    "heater_long_on",
    longOn,
    () => ({ message: ruleWording.longOnRaised(who), detail: { since: iso(o.onSinceMs), lastedMin: lasted(o.onSinceMs, nowMs), ...names } }),
    ruleWording.longOnCleared(who),
  );
  return { conditions: next, changes };
}
