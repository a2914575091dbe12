import type { AlertKind } from "@/lib/domain";

/** A line on what each kind of alert means, for the member choosing their e-mails. */
export const ALERT_KIND_MEANINGS: Record<AlertKind, string> = {
  too_cold: "A house is colder than its frost alert temperature.",
  too_warm: "A house is warmer than its too-warm temperature.",
  too_hot: "A house reached its high limit and its heaters were cut out.",
  sensor_quiet: "A sensor has sent no reading for a while.",
  battery_low: "A sensor’s battery is running down.",
  plug_unanswered: "A plug did not confirm a command.",
  plug_offline: "A plug has dropped off the network.",
  plug_mismatch: "A plug is on or off against its last command.",
  overload: "An appliance draws more than its plug may carry for hours.",
  condensation: "The air is near its dew point, or very humid for hours: leaves stay wet.",
  heater_long_on: "A heater has run for hours without a break: a door open, a fault, heat escaping.",
  controller_silent: "Cloche’s control has stopped: plugs follow their own fallback.",
};
