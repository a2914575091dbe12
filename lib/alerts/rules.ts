// A house's alert rules: what counts as wrong, how long it must last before anyone is
// told, and how far back it must come before it is "back to normal". One schema serves
// the settings form, its handler and the controller that evaluates the rules.
//
// Flapping is kept down in two ways, both stated in the settings:
// - a minimum duration: a condition must hold for `holdMin` minutes (per rule) before
//   the alert opens, so a reading dipping across a limit for a moment sends nothing;
// - a hysteresis: an open temperature alert closes only once the reading is back past
//   the limit by `hysteresisK` (humidity by `hysteresisRh`, battery by 5 points).
// Once open, an alert stays one alert until it clears; reminders go out every
// `reminderMin` minutes while nobody has acknowledged it.
import { z } from "zod";
import { temperatureC } from "@/lib/schemas/common";

const wholeMinutes = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number` })
    .int(`${label} must be a whole number of minutes`)
    .min(min, `${label} must be at least ${min} min`)
    .max(max, `${label} must be at most ${max} min`);

/** A temperature difference in K; the bounds are told in °F too, as the person may type in °F. */
const difference = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number` })
    .min(min, `${label} must be at least ${min} K (${min * 1.8} °F)`)
    .max(max, `${label} must be at most ${max} K (${max * 1.8} °F)`);

const number = (label: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `${label} must be a number` })
    .min(min, `${label} must be at least ${min}${unit}`)
    .max(max, `${label} must be at most ${max}${unit}`);

/** Temperatures here are °C, as everywhere in the store; the form converts a °F entry first. */
export const alertRulesSchema = z
  .object({
    frost: z.object({
      /** null: the house's own frost limit (houses.low_limit_c). Frost risk cannot be turned off. */
      belowC: temperatureC("Frost alert temperature", -20, 15).nullable(),
      holdMin: wholeMinutes("Frost risk: minimum duration", 0, 60),
    }),
    tooWarm: z.object({
      enabled: z.boolean(),
      aboveC: temperatureC("Too-warm temperature", 15, 60),
      holdMin: wholeMinutes("Too warm: minimum duration", 0, 120),
    }),
    /** How far back past the limit a temperature must come before its alert closes. */
    hysteresisK: difference("Temperature hysteresis", 0, 5),
    sensorSilent: z.object({
      enabled: z.boolean(),
      afterMin: wholeMinutes("Sensor silent after", 2, 24 * 60),
    }),
    batteryLow: z.object({
      enabled: z.boolean(),
      belowPercent: number("Battery low level", 1, 80, " %"),
    }),
    plugOffline: z.object({
      enabled: z.boolean(),
      afterMin: wholeMinutes("Plug offline after", 1, 24 * 60),
    }),
    plugMismatch: z.object({
      enabled: z.boolean(),
      afterMin: wholeMinutes("Plug not as commanded after", 1, 24 * 60),
    }),
    condensation: z.object({
      enabled: z.boolean(),
      /** Open when the air is within this many K of its dew point for holdMin minutes. */
      dewMarginK: difference("Dew-point margin", 0, 10),
      holdMin: wholeMinutes("Condensation: minimum duration", 0, 24 * 60),
      /** …or when relative humidity stays at or above this for humidHours. */
      humidAboveRh: number("Humidity level", 50, 100, " %"),
      humidHours: number("Humid stretch", 0.5, 72, " h"),
      hysteresisRh: number("Humidity hysteresis", 0, 20, " %"),
    }),
    heaterLongOn: z.object({
      enabled: z.boolean(),
      afterHours: number("Heater on longer than", 1, 168, " h"),
    }),
    reminderMin: wholeMinutes("Reminder interval", 15, 7 * 24 * 60),
  })
  .superRefine((rules, ctx) => {
    if (rules.frost.belowC !== null && rules.tooWarm.enabled && rules.frost.belowC + 2 * rules.hysteresisK >= rules.tooWarm.aboveC) {
      ctx.addIssue({
        code: "custom",
        path: ["tooWarm", "aboveC"],
        message: "The too-warm temperature must be well above the frost alert temperature (more than twice the hysteresis)",
      });
    }
  });

export type AlertRules = z.infer<typeof alertRulesSchema>;

/**
 * The defaults a new house starts with. Sources, where there are any:
 * - frost: the house's frost limit (2 °C unless the grower set another); most tender
 *   crops are damaged near 0 °C (common practice, no published source);
 * - too warm 32 °C: many greenhouse crops stop growing well above about 30 °C
 *   (common practice, no published source);
 * - condensation within 1 K of the dew point, or 95 % RH for 4 h: leaves wet for hours
 *   invite botrytis and downy mildew (common practice, no published source);
 * - sensor silent after 15 min: sensors report every minute or so, and the plugs'
 *   stale limit is 10 min (DEFAULT_STALE_AFTER_S);
 * - heater on 12 h without a break: a winter night in a well-sealed house cycles the
 *   heater long before that (common practice, no published source).
 */
export const DEFAULT_ALERT_RULES: AlertRules = {
  frost: { belowC: null, holdMin: 2 },
  tooWarm: { enabled: true, aboveC: 32, holdMin: 10 },
  hysteresisK: 0.5,
  sensorSilent: { enabled: true, afterMin: 15 },
  batteryLow: { enabled: true, belowPercent: 15 },
  plugOffline: { enabled: true, afterMin: 5 },
  plugMismatch: { enabled: true, afterMin: 3 },
  condensation: { enabled: true, dewMarginK: 1, holdMin: 30, humidAboveRh: 95, humidHours: 4, hysteresisRh: 3 },
  heaterLongOn: { enabled: true, afterHours: 12 },
  reminderMin: 120,
};

/** Battery alerts close once the level is this many points above the limit (a new battery reads far higher). */
export const BATTERY_HYSTERESIS_PERCENT = 5;

/**
 * A stored rule set read back: missing or broken parts fall back to the defaults
 * part by part, so a rule added later never leaves a house without it.
 */
export function storedAlertRules(stored: unknown): AlertRules {
  if (stored === null || stored === undefined || typeof stored !== "object") return DEFAULT_ALERT_RULES;
  const merged: Record<string, unknown> = { ...DEFAULT_ALERT_RULES };
  for (const [key, fallback] of Object.entries(DEFAULT_ALERT_RULES)) {
    const value = (stored as Record<string, unknown>)[key];
    if (value === undefined) continue;
    merged[key] = fallback !== null && typeof fallback === "object" && value !== null && typeof value === "object" ? { ...fallback, ...value } : value;
  }
  const parsed = alertRulesSchema.safeParse(merged);
  return parsed.success ? parsed.data : DEFAULT_ALERT_RULES;
}

/** The frost alert temperature in force: the rule's own, or the house's frost limit. */
export function frostAlertC(rules: AlertRules, houseLowLimitC: number): number {
  return rules.frost.belowC ?? houseLowLimitC;
}
