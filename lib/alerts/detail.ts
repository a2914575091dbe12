// What an alert row's `detail` holds: the figures the rule saw, in °C and SI units, so
// that each reader (the alerts page, an e-mail) shows them in their own temperature
// unit. The row's `message` is a short sentence without figures.
export type AlertDetail = {
  /** The reading that opened it, and the limit it crossed (°C). */
  valueC?: number;
  limitC?: number;
  /** The hysteresis it must come back by before it clears (K). */
  hysteresisK?: number;
  /** Relative humidity %, and the dew point worked out from it (°C). */
  rh?: number;
  dewPointC?: number;
  /** A humidity limit crossed (%). */
  limitRh?: number;
  /** Battery level as a percentage (0–100), and the level it fell below. */
  batteryPercent?: number;
  limitPercent?: number;
  /** Which condensation rule opened it: the air near its dew point, or a long humid stretch. */
  condensation?: "near_dew_point" | "humid_for_hours";
  /** How long the condition had lasted when the alert opened, in minutes. */
  lastedMin?: number;
  /** When the condition began (ISO 8601 UTC): the last reading heard, the plug going offline, the heater coming on. */
  since?: string;
  /** A plug's reported state against the one it was last commanded to. */
  reportedOn?: boolean;
  commandedOn?: boolean;
  /** Names as they were when it opened, so a message reads right after a rename. */
  houseName?: string;
  sensorName?: string;
  plugName?: string;
  /** Set when it cleared: what the reading or state was then. */
  cleared?: { valueC?: number; rh?: number; batteryPercent?: number; at: string };
};

/** A stored detail read back defensively: anything not shaped as above is dropped. */
export function alertDetailFrom(value: unknown): AlertDetail {
  if (value === null || typeof value !== "object" || Array.isArray(value)) return {};
  const v = value as Record<string, unknown>;
  const out: AlertDetail = {};
  for (const key of ["valueC", "limitC", "hysteresisK", "rh", "dewPointC", "limitRh", "batteryPercent", "limitPercent", "lastedMin"] as const) {
    if (typeof v[key] === "number" && Number.isFinite(v[key])) out[key] = v[key] as number;
  }
  for (const key of ["since", "houseName", "sensorName", "plugName"] as const) {
    if (typeof v[key] === "string") out[key] = v[key] as string;
  }
  if (v.condensation === "near_dew_point" || v.condensation === "humid_for_hours") out.condensation = v.condensation;
  for (const key of ["reportedOn", "commandedOn"] as const) {
    if (typeof v[key] === "boolean") out[key] = v[key] as boolean;
  }
  const c = v.cleared;
  if (c && typeof c === "object" && typeof (c as Record<string, unknown>).at === "string") {
    const cleared = c as Record<string, unknown>;
    out.cleared = { at: cleared.at as string };
    for (const key of ["valueC", "rh", "batteryPercent"] as const) {
      if (typeof cleared[key] === "number") out.cleared[key] = cleared[key] as number;
    }
  }
  return out;
}
