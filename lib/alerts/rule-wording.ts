// What the rule-based alerts say, opening and closing. Sentences name the house and the
// sensor or plug and carry no figures: each reader shows the figures of the alert's
// detail in their own unit (lib/alerts/detail.ts).
import { ALERT_KIND_LABELS, type AlertKind } from "@/lib/domain";

export type Named = { name: string; houseName: string };

export const ruleWording = {
  frostRaised: (s: Named) => `Frost risk in ${s.houseName}: ${s.name} is at or below the frost alert temperature.`,
  frostCleared: (s: Named) => `${s.name} in ${s.houseName} is above the frost alert temperature again.`,
  warmRaised: (s: Named) => `Too warm in ${s.houseName}: ${s.name} is at or above the too-warm temperature.`,
  warmCleared: (s: Named) => `${s.name} in ${s.houseName} is below the too-warm temperature again.`,
  batteryRaised: (s: Named) => `${s.name} in ${s.houseName} needs a new battery soon.`,
  batteryCleared: (s: Named) => `The battery of ${s.name} in ${s.houseName} is good again.`,
  dewRaised: (s: Named) => `Condensation risk in ${s.houseName}: the air is close to its dew point at ${s.name}.`,
  humidRaised: (s: Named) => `Condensation risk in ${s.houseName}: the air has been very humid for hours at ${s.name}.`,
  condensationCleared: (s: Named) => `The air is drier again at ${s.name} in ${s.houseName}.`,
  silentRaised: (s: Named) => `${s.name} in ${s.houseName} has gone silent: no reading has come in for longer than its limit.`,
  silentCleared: (s: Named) => `${s.name} in ${s.houseName} is reporting again.`,
  offlineRaised: (p: Named) => `${p.name} in ${p.houseName} is offline or has not been heard from.`,
  offlineCleared: (p: Named) => `${p.name} in ${p.houseName} is online again.`,
  mismatchRaised: (p: Named) => `${p.name} in ${p.houseName} is not in the state Cloche switched it to.`,
  mismatchCleared: (p: Named) => `${p.name} in ${p.houseName} is in the state Cloche switched it to.`,
  longOnRaised: (p: Named) => `${p.name} in ${p.houseName} has been on without a break for longer than its limit.`,
  longOnCleared: (p: Named) => `${p.name} in ${p.houseName} has switched off.`,
  /** The rule was turned off, or no longer applies (a sensor moved outside, a plug no longer a heater). */
  noLongerWatched: (kind: AlertKind, s: Named) => `Closed: ${ALERT_KIND_LABELS[kind].toLowerCase()} is no longer watched for ${s.name} in ${s.houseName}.`,
};
