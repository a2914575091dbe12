// What the controller's alerts say, and which the decision raises or clears.
import type { Decision } from "@/lib/control";
import type { AlertSubject, Alerts } from "./alerts";
import type { PlugRuntime } from "./registry";

export function plugSubject(runtime: PlugRuntime): AlertSubject {
  return { siteId: runtime.site.id, houseId: runtime.config.houseId, plugId: runtime.config.id };
}

/** Raises what the decision says is wrong with the plug, and clears what is no longer. */
export function followDecisionAlerts(alerts: Alerts, runtime: PlugRuntime, decision: Decision) {
  const subject = plugSubject(runtime);
  const has = (a: Decision["alerts"][number]) => decision.alerts.includes(a);
  const name = runtime.config.name;
  const sensorSubject = runtime.config.sensorId
    ? { siteId: runtime.site.id, houseId: runtime.config.houseId, sensorId: runtime.config.sensorId }
    : subject;
  // Sensor silence is shared with the house's alert rules and closed only by a reading
  // (alert-watch.ts), so the decision raises it and never closes it.
  if (has("sensor_quiet")) {
    const action = decision.cause === "failsafe" ? "; it is on its quiet-sensor fail-safe" : "";
    alerts.raise("sensor_quiet", sensorSubject, `No fresh reading for ${name}${action}.`);
  }
  if (has("overload")) alerts.raise("overload", subject, `${name}: the appliance draws more than the plug may carry for hours; kept off.`);
  else if (alerts.isOpen("overload", subject)) alerts.clear("overload", subject, `${name} may carry its appliance again.`);
  if (has("too_hot")) alerts.raise("too_hot", subject, `${name}: at or above the house's high limit; heater kept off.`);
  else if (alerts.isOpen("too_hot", subject)) {
    const reading = decision.readingTempC === null ? {} : { valueC: decision.readingTempC };
    alerts.clear("too_hot", subject, `${name} is below the house's high limit again.`, reading);
  }
}

export function raiseUnanswered(alerts: Alerts, runtime: PlugRuntime, attempts: number, commandId: string) {
  alerts.raise("plug_unanswered", plugSubject(runtime), `${runtime.config.name} has not answered ${attempts} commands.`, { commandId });
}

export function clearUnanswered(alerts: Alerts, runtime: PlugRuntime) {
  alerts.clear("plug_unanswered", plugSubject(runtime));
}
