// The rules form's values: the rules as the person reads and types them, temperatures in
// their own unit (differences scaled without the offset), and whether the frost alert
// follows the house's frost limit. `toRules` turns them back into °C for the schema.
import type { AlertRules } from "@/lib/alerts/rules";
import type { TemperatureUnit } from "@/lib/domain";
import { differenceToUnit, fromUnit } from "@/lib/units";
import { inUnit } from "@/components/setup/with-celsius";

export type RulesDraft = Omit<AlertRules, "frost"> & {
  frost: { belowC: number; holdMin: number };
  frostFollows: "house" | "own";
};

const round = (n: number, digits: number) => Math.round(n * 10 ** digits) / 10 ** digits;

/** A difference typed in `unit`, in K (°C), to a hundredth. */
export function differenceFromUnit(delta: number, unit: TemperatureUnit): number {
  return unit === "f" ? round((delta * 5) / 9, 2) : delta;
}

/** A difference in K as the form shows it, to a tenth of the person's unit. */
export const differenceInUnit = (deltaK: number, unit: TemperatureUnit) => round(differenceToUnit(deltaK, unit), 1);

export function draftOf(rules: AlertRules, unit: TemperatureUnit, houseLowLimitC: number): RulesDraft {
  return {
    ...rules,
    frostFollows: rules.frost.belowC === null ? "house" : "own",
    frost: { belowC: inUnit(rules.frost.belowC ?? houseLowLimitC, unit), holdMin: rules.frost.holdMin },
    tooWarm: { ...rules.tooWarm, aboveC: inUnit(rules.tooWarm.aboveC, unit) },
    hysteresisK: differenceInUnit(rules.hysteresisK, unit),
    condensation: { ...rules.condensation, dewMarginK: differenceInUnit(rules.condensation.dewMarginK, unit) },
  };
}

export function toRules(draft: RulesDraft, unit: TemperatureUnit): AlertRules {
  const { frostFollows, ...rest } = draft;
  return {
    ...rest,
    frost: { belowC: frostFollows === "house" ? null : fromUnit(draft.frost.belowC, unit), holdMin: draft.frost.holdMin },
    tooWarm: { ...draft.tooWarm, aboveC: fromUnit(draft.tooWarm.aboveC, unit) },
    hysteresisK: differenceFromUnit(draft.hysteresisK, unit),
    condensation: { ...draft.condensation, dewMarginK: differenceFromUnit(draft.condensation.dewMarginK, unit) },
  };
}

/** Every field of the form, as the handler names them in its errors. */
export const RULE_FIELDS = [
  "frost.belowC",
  "frost.holdMin",
  "tooWarm.enabled",
  "tooWarm.aboveC",
  "tooWarm.holdMin",
  "hysteresisK",
  "sensorSilent.enabled",
  "sensorSilent.afterMin",
  "batteryLow.enabled",
  "batteryLow.belowPercent",
  "plugOffline.enabled",
  "plugOffline.afterMin",
  "plugMismatch.enabled",
  "plugMismatch.afterMin",
  "condensation.enabled",
  "condensation.dewMarginK",
  "condensation.holdMin",
  "condensation.humidAboveRh",
  "condensation.humidHours",
  "condensation.hysteresisRh",
  "heaterLongOn.enabled",
  "heaterLongOn.afterHours",
  "reminderMin",
] as const;
