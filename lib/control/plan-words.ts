// What is in force for a plug, in a grower's words: the one place this wording lives,
// shared by the houses overview and any page that tells what a plug follows now.
// Temperatures arrive in °C and are shown in the person's unit; times in the site's zone.
import type { TemperatureUnit } from "../domain";
import { toUnit, unitSymbol } from "../units";

/** A plan rule (lib/control/plan.ts) with what a person needs to read it. */
export type RuleView =
  | { kind: "override"; on: boolean; by: string | null; reason: string | null }
  | { kind: "window"; mode: "band"; lowC: number | null; highC: number | null; scheduleName: string | null }
  | { kind: "window"; mode: "on" | "off"; scheduleName: string | null }
  | { kind: "frost"; lowC: number | null; highC: number | null }
  | { kind: "off" };

type Instant = Date | string;

export type InForceView = {
  rule: RuleView;
  /** When the rule gives way to the next one; null when nothing is due to change. */
  until: Instant | null;
  next: RuleView | null;
  /** The anti-short-cycle guard holds a change back until then (plug_states.guard_until). */
  guardUntil: Instant | null;
};

export type InForceWords = {
  /** "Band 8–10 °C (Winter nights) until 07:00, then frost protection 3–5 °C". */
  line: string;
  /** Who set an override and why. */
  detail: string | null;
  /** "Waiting out the minimum on/off time until 14:32", while the guard holds. */
  guard: string | null;
};

const asDate = (at: Instant) => (typeof at === "string" ? new Date(at) : at);

const oneDecimal = new Intl.NumberFormat("en", { maximumFractionDigits: 1, minimumFractionDigits: 0 });

/** A temperature in the person's unit, with a true minus sign: "8", "46.4", "−2". */
function degrees(c: number, unit: TemperatureUnit): string {
  const text = oneDecimal.format(toUnit(c, unit));
  return text === "-0" ? "0" : text.replace("-", "−");
}

/** "8–10 °C", "up to 10 °C", "from 8 °C", or "edges not set". */
export function bandWords(lowC: number | null, highC: number | null, unit: TemperatureUnit): string {
  const u = unitSymbol(unit);
  if (lowC !== null && highC !== null) return `${degrees(lowC, unit)}–${degrees(highC, unit)} ${u}`;
  if (highC !== null) return `up to ${degrees(highC, unit)} ${u}`;
  if (lowC !== null) return `from ${degrees(lowC, unit)} ${u}`;
  return "edges not set";
}

/** The rule alone, starting with a capital: "Band 8–10 °C (Winter nights)", "Override: on". */
export function ruleWords(rule: RuleView, unit: TemperatureUnit): string {
  switch (rule.kind) {
    case "override":
      return `Override: ${rule.on ? "on" : "off"}`;
    case "window": {
      const from = rule.scheduleName ? ` (${rule.scheduleName})` : "";
      if (rule.mode === "band") return `Band ${bandWords(rule.lowC, rule.highC, unit)}${from}`;
      return `${rule.mode === "on" ? "On" : "Off"} by the schedule${from}`;
    }
    case "frost":
      return `Frost protection ${bandWords(rule.lowC, rule.highC, unit)}`;
    case "off":
      return "Off outside windows";
  }
}

const lowerFirst = (text: string) => text.charAt(0).toLowerCase() + text.slice(1);

const dayKey = (at: Date, timeZone: string) =>
  new Intl.DateTimeFormat("en-CA", { year: "numeric", month: "2-digit", day: "2-digit", timeZone }).format(at);

/**
 * An instant to come, as a grower reads it in the site's zone: "18:00" today,
 * "tomorrow 06:00", "Fri 06:00" within the week, "12 Mar 06:00" beyond.
 */
export function whenWords(at: Instant, now: Instant, timeZone: string): string {
  const when = asDate(at);
  const from = asDate(now);
  const time = new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(when);
  const days = Math.round((Date.parse(dayKey(when, timeZone)) - Date.parse(dayKey(from, timeZone))) / 86_400_000);
  if (days <= 0) return time;
  if (days === 1) return `tomorrow ${time}`;
  if (days < 7) return `${new Intl.DateTimeFormat("en-GB", { weekday: "short", timeZone }).format(when)} ${time}`;
  return `${new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone }).format(when)} ${time}`;
}

/** The in-force line with the next change and what follows, the override's who and why, and the guard's wait. */
export function describeInForce(
  view: InForceView,
  { unit, timeZone, now }: { unit: TemperatureUnit; timeZone: string; now: Instant },
): InForceWords {
  const { rule, until, next } = view;
  let line = ruleWords(rule, unit);
  if (until) line += ` until ${whenWords(until, now, timeZone)}`;
  else if (rule.kind === "override") line += ", with no end set";
  if (until && next) line += `, then ${lowerFirst(ruleWords(next, unit))}`;

  let detail: string | null = null;
  if (rule.kind === "override" && (rule.by || rule.reason)) {
    detail = [rule.by ? `by ${rule.by}` : null, rule.reason || null].filter(Boolean).join(": ");
    detail = detail.charAt(0).toUpperCase() + detail.slice(1);
  }

  const guardUntil = view.guardUntil ? asDate(view.guardUntil) : null;
  const guard =
    guardUntil && guardUntil.getTime() > asDate(now).getTime()
      ? `Waiting out the minimum on/off time until ${whenWords(guardUntil, now, timeZone)}`
      : null;

  return {
    line,
    detail,
    guard,
  };
}
