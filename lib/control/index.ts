export { decide } from "./decide";
export { describeCause } from "./describe";
export { currentDrawA, isOverloaded } from "./electrical";
export { dutyCycleOn } from "./duty";
export type { ActiveWindow, Alert, Cause, Decision, DecisionInput, PlugRules, WindowRule } from "./types";
export { sharedRules, sharedWindow } from "./shared";
