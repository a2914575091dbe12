import type { AlertKind, ApplianceKind, FailsafeMode, OutsideWindowMode, WindowMode } from "@/lib/domain";

/** What an evaluation of one plug can be driven by, strongest first. */
export type Cause = "safety" | "override" | "schedule" | "default" | "failsafe";

export type Alert = Extract<AlertKind, "sensor_quiet" | "overload" | "too_hot">;

/** What the time window in force asks of a plug (an occurrence of lib/schedule fits); null outside windows. */
export type ActiveWindow = {
  window: WindowRule;
} | null;

export type WindowRule = { mode: WindowMode; lowC: number | null; highC: number | null };

/** A plug's settings, its house's high limit and its site's mains voltage, flattened for the hot path. */
export type PlugRules = {
  applianceKind: ApplianceKind;
  applianceWatts: number;
  ratedCurrentA: number;
  mainsVoltage: number;
  /** The site's margin for loads that run for hours: percent of the plug's rating they may draw. */
  continuousLoadPercent: number;
  /** The house's safety cut-out: heaters are off at or above it. */
  highLimitC: number;
  failsafe: FailsafeMode;
  failsafeDutyPercent: number | null;
  failsafeDutyPeriodS: number;
  staleAfterS: number;
  outsideWindows: OutsideWindowMode;
  frostLowC: number | null;
  frostHighC: number | null;
  minOnS: number;
  minOffS: number;
};

export type DecisionInput = {
  rules: PlugRules;
  nowMs: number;
  /** The latest reading of the plug's sensor, or null when there has been none. */
  reading: { tempC: number | null; atMs: number } | null;
  /** The plug's state and since when; null when it is not known (fresh start, no report yet). */
  current: { on: boolean; sinceMs: number } | null;
  /** An override the caller already knows to be active now. */
  override: { id: string; on: boolean } | null;
  window: ActiveWindow;
};

export type Decision = {
  /** The state the plug should be in now. */
  on: boolean;
  cause: Cause;
  /** What the rule in force asks for, before the anti-short-cycle guard. */
  wanted: boolean;
  /** When the guard holds a change back: the instant it lets it through. */
  guardUntilMs: number | null;
  /** Short, for people: "at or below 8 °C low edge". */
  reason: string;
  /** The latest fresh temperature, whether or not the rule in force used it. */
  readingTempC: number | null;
  /** Shared and frozen: do not modify. */
  alerts: readonly Alert[];
};
