// Words for a plan and for what the plug follows, in the person's unit.
import type { PlanRule } from "@/lib/control/plan";
import { bandWords } from "@/lib/control/plan-words";
import type { TemperatureUnit } from "@/lib/domain";
import type { PlanInput, WindowInput } from "@/lib/schemas/schedule";
import { toUnit, unitSymbol } from "@/lib/units";
import { describeDays, describeTimes } from "./week";

const trim = (n: number) => String(Math.round(n * 10) / 10);
const temp = (c: number | null, unit: TemperatureUnit) => (c === null ? "?" : `${trim(toUnit(c, unit))} ${unitSymbol(unit)}`);
const heats = (lowC: number | null, highC: number | null, unit: TemperatureUnit) =>
  `Heats at or below ${temp(lowC, unit)} until ${temp(highC, unit)}`;

/** "8–10 °C"; "46.4–50 °F": the one wording of a band (lib/control/plan-words.ts). */
export const formatBand = bandWords;

/** What a window does: its band, or "On" / "Off". */
export function windowSetting(w: Pick<WindowInput, "mode" | "lowC" | "highC">, unit: TemperatureUnit): string {
  if (w.mode === "band") return formatBand(w.lowC, w.highC, unit);
  return w.mode === "on" ? "On" : "Off";
}

/** "Mon–Fri 06:00–21:00, 8–10 °C". */
export function describeWindow(w: WindowInput, unit: TemperatureUnit): string {
  return `${describeDays(w.days)} ${describeTimes(w)}, ${windowSetting(w, unit)}`;
}

export function describeOutside(plan: Pick<PlanInput, "outsideWindows" | "frostLowC" | "frostHighC">, unit: TemperatureUnit): string {
  return plan.outsideWindows === "frost" ? `frost protection ${formatBand(plan.frostLowC, plan.frostHighC, unit)}` : "off";
}

/** One line for the schedules index: the windows, then what happens outside them. */
export function summarizePlan(plan: PlanInput, unit: TemperatureUnit): string {
  const windows = plan.windows.length === 0 ? "No windows" : plan.windows.map((w) => describeWindow(w, unit)).join("; ");
  return `${windows}. Outside windows: ${describeOutside(plan, unit)}.`;
}

/** What the plug is allowed to do under a rule of the preview. */
export function describeRule(rule: PlanRule, unit: TemperatureUnit): { label: string; detail: string; tone: "band" | "on" | "off" | "frost" | "override" } {
  switch (rule.kind) {
    case "override":
      return { label: `Override: ${rule.on ? "on" : "off"}`, detail: "Someone switched it by hand; the plan waits", tone: "override" };
    case "frost":
      return {
        label: `Frost protection ${formatBand(rule.lowC, rule.highC, unit)}`,
        detail: heats(rule.lowC, rule.highC, unit),
        tone: "frost",
      };
    case "off":
      return { label: "Off", detail: "Outside the windows: off", tone: "off" };
    case "window":
      if (rule.mode === "band") {
        return {
          label: formatBand(rule.lowC, rule.highC, unit),
          detail: heats(rule.lowC, rule.highC, unit),
          tone: "band",
        };
      }
      return rule.mode === "on" ? { label: "On", detail: "On for the whole window", tone: "on" } : { label: "Off", detail: "Off for the whole window", tone: "off" };
  }
}
