export { decide } from "./decide";
export { describeCause } from "./describe";
export { checkLoad, currentDrawA, type LoadCheck } from "./electrical";
export { dutyCycleOn } from "./duty";
export type { ActiveWindow, Alert, Cause, Decision, DecisionInput, PlugRules, WindowRule } from "./types";
export { sharedRules, sharedWindow } from "./shared";
export { isReadingStale, sensorStaleAfterS } from "./sensor";
