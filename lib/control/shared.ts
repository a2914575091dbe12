import type { ActiveWindow, PlugRules, WindowRule } from "./types";

// Plugs with the same settings share one frozen rules object, and windows with the
// same rule one frozen window. A tick over 10,000 plugs then reads a handful of objects
// that stay in the CPU's cache rather than 10,000 scattered ones: about twice as fast
// (npm run bench:controller).
const MAX_SHARED = 10_000;
const rulesBySettings = new Map<string, PlugRules>();
const windowsByRule = new Map<string, NonNullable<ActiveWindow>>();

function shared<T extends object>(cache: Map<string, T>, key: string, make: () => T): T {
  let value = cache.get(key);
  if (value === undefined) {
    if (cache.size >= MAX_SHARED) cache.clear();
    value = Object.freeze(make());
    cache.set(key, value);
  }
  return value;
}

export function sharedRules(rules: PlugRules): PlugRules {
  const key = [
    rules.applianceKind,
    rules.applianceWatts,
    rules.ratedCurrentA,
    rules.mainsVoltage,
    rules.continuousLoadPercent,
    rules.highLimitC,
    rules.failsafe,
    rules.failsafeDutyPercent,
    rules.failsafeDutyPeriodS,
    rules.staleAfterS,
    rules.outsideWindows,
    rules.frostLowC,
    rules.frostHighC,
    rules.minOnS,
    rules.minOffS,
  ].join("|");
  return shared(rulesBySettings, key, () => ({ ...rules }));
}

export function sharedWindow(rule: WindowRule): NonNullable<ActiveWindow> {
  const { mode, lowC, highC } = rule;
  return shared(windowsByRule, `${mode}|${lowC}|${highC}`, () => ({ window: Object.freeze({ mode, lowC, highC }) }));
}
