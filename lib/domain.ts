// Value lists shared by the schema, the forms and the pages. Kept free of database
// imports so client components can use them.
export { ROLES, type Role } from "./permissions";

export const HOUSE_KINDS = ["glasshouse", "polytunnel", "propagation", "other"] as const;
export type HouseKind = (typeof HOUSE_KINDS)[number];

export const GLAZINGS = [
  "single_glass",
  "double_glass",
  "single_film",
  "double_film_inflated",
  "twin_wall_polycarbonate",
  "single_rigid_plastic",
] as const;
export type Glazing = (typeof GLAZINGS)[number];

export const HOUSE_KIND_LABELS: Record<HouseKind, string> = {
  glasshouse: "Glasshouse",
  polytunnel: "Polytunnel",
  propagation: "Propagation house",
  other: "Other",
};

export const GLAZING_LABELS: Record<Glazing, string> = {
  single_glass: "Single glass",
  double_glass: "Double glass",
  single_film: "Single film",
  double_film_inflated: "Double film, inflated",
  twin_wall_polycarbonate: "Twin-wall polycarbonate",
  single_rigid_plastic: "Single rigid plastic",
};

export const APPLIANCE_KINDS = ["heater", "fan", "light", "other"] as const;
export type ApplianceKind = (typeof APPLIANCE_KINDS)[number];

export const APPLIANCE_KIND_LABELS: Record<ApplianceKind, string> = {
  heater: "Heater",
  fan: "Fan",
  light: "Light",
  other: "Other appliance",
};

/**
 * Why a plug is in its state. The decision's causes (`failsafe` is the controller's
 * rule for a quiet sensor), and two the controller only observes: `plug_fallback`, a
 * plug that switched by itself (its command lease ran out), and `resync`, a plug found
 * in another state than the log says after a command the controller does not know.
 */
export const SWITCH_CAUSES = ["safety", "override", "schedule", "default", "failsafe", "plug_fallback", "resync"] as const;
export type SwitchCause = (typeof SWITCH_CAUSES)[number];

/** One label per cause, for every page, list and export. */
export const SWITCH_CAUSE_LABELS: Record<SwitchCause, string> = {
  safety: "Safety cut-out",
  override: "Manual override",
  schedule: "Schedule",
  default: "Outside time windows",
  failsafe: "Quiet-sensor fail-safe",
  plug_fallback: "Plug's own fall-back",
  resync: "Found changed",
};

/** What a time window asks of its plug: hold a temperature band, or simply on or off. */
export const WINDOW_MODES = ["band", "on", "off"] as const;
export type WindowMode = (typeof WINDOW_MODES)[number];

export const WINDOW_MODE_LABELS: Record<WindowMode, string> = {
  band: "Temperature band",
  on: "On",
  off: "Off",
};

/** What a plug does when the sensor its band is judged by goes quiet. */
export const FAILSAFE_MODES = ["off", "on", "duty"] as const;
export type FailsafeMode = (typeof FAILSAFE_MODES)[number];

export const FAILSAFE_MODE_LABELS: Record<FailsafeMode, string> = {
  off: "Off",
  on: "On",
  duty: "On and off in a duty cycle",
};

/** What a plug does outside its time windows. */
export const OUTSIDE_WINDOW_MODES = ["off", "frost"] as const;
export type OutsideWindowMode = (typeof OUTSIDE_WINDOW_MODES)[number];

export const OUTSIDE_WINDOW_MODE_LABELS: Record<OutsideWindowMode, string> = {
  off: "Off",
  frost: "Frost protection band",
};

/** What an alert is about. */
export const ALERT_KINDS = [
  "sensor_quiet",
  "plug_unanswered",
  "plug_offline",
  "too_hot",
  "too_cold",
  "overload",
  "too_warm",
  "battery_low",
  "plug_mismatch",
  "condensation",
  "heater_long_on",
  "controller_silent",
] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];

export const ALERT_KIND_LABELS: Record<AlertKind, string> = {
  sensor_quiet: "Sensor silent",
  plug_unanswered: "Plug not answering",
  plug_offline: "Plug offline",
  too_hot: "Heater cut out at the high limit",
  too_cold: "Frost risk",
  overload: "Plug overloaded",
  too_warm: "Too warm",
  battery_low: "Sensor battery low",
  plug_mismatch: "Plug not as commanded",
  condensation: "Condensation risk",
  heater_long_on: "Heater on for a long time",
  controller_silent: "Control stopped",
};

/**
 * Frost risk always goes out: nobody can turn it off or hold it back for quiet hours.
 * Every other kind is each member's own choice (lib/alerts/preferences.ts).
 */
export const ALWAYS_SENT_ALERT_KINDS: readonly AlertKind[] = ["too_cold"];

/** What an e-mail in the outbox is for (outbound_mail.purpose). */
export const MAIL_PURPOSES = ["alert_raised", "alert_reminder", "alert_cleared", "daily_summary"] as const;
export type MailPurpose = (typeof MAIL_PURPOSES)[number];

/**
 * Where an e-mail in the outbox stands. `waiting`: to be sent at due_at (a retry waits
 * here too, with attempts > 0 and last_error set); `held`: kept back by the member's
 * quiet hours until due_at; `skipped`: not sent, and why is in last_error (for example
 * back to normal before quiet hours ended); `given_up`: retried for a day without success.
 */
export const MAIL_STATUSES = ["waiting", "held", "sent", "skipped", "given_up"] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

/** A reading older than this counts as stale, unless a plug says otherwise (plugs.stale_after_s's default). */
export const DEFAULT_STALE_AFTER_S = 600;

/** A load that runs for hours may draw at most this percent of its plug's rating (sites.continuous_load_percent). */
export const CONTINUOUS_LOAD_PERCENT = { default: 80, min: 50, max: 100, label: "Continuous-load margin" } as const;

/** Each person's own choice of how temperatures are shown and typed. */
export const TEMPERATURE_UNITS = ["c", "f"] as const;
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number];
export const TEMPERATURE_UNIT_LABELS: Record<TemperatureUnit, string> = { c: "°C", f: "°F" };

/** How long an invitation link stays usable. */
export const INVITATION_TTL_HOURS = 72;

/** What an entry in the audit trail is about (audit_log.entity_type), for the activity page. */
export const AUDIT_ENTITY_LABELS: Record<string, string> = {
  site: "Site settings",
  house: "House",
  plug: "Plug",
  sensor: "Sensor",
  credential: "Device credential",
  schedule: "Schedule",
  window: "Time window",
  exception: "Date exception",
  override: "Override",
  member: "Member",
  invitation: "Invitation",
  tariff: "Tariff",
  bill: "Bill",
  settings: "Personal settings",
  alert: "Alert",
  alert_rules: "Alert rules",
  alert_preferences: "Alert e-mails",
  reading_import: "Imported readings",
};

/**
 * What was done (audit_log.action, `<entity>.<verb>`). An action missing here is shown
 * by its entity's label and its verb (see describeAuditAction), so a new one never
 * breaks the page.
 */
export const AUDIT_ACTION_LABELS: Record<string, string> = {
  "site.create": "Created the site",
  "site.update": "Changed the site settings",
  "house.create": "Added a house",
  "house.update": "Changed a house",
  "house.delete": "Removed a house",
  "plug.create": "Added a plug",
  "plug.update": "Changed a plug",
  "plug.retire": "Retired a plug",
  "sensor.create": "Added a sensor",
  "sensor.update": "Changed a sensor",
  "sensor.retire": "Retired a sensor",
  "credential.issue": "Issued a device secret",
  "credential.revoke": "Revoked a device secret",
  "schedule.create": "Added a schedule",
  "schedule.update": "Changed a schedule",
  "schedule.delete": "Removed a schedule",
  "override.create": "Overrode a plug",
  "override.cancel": "Cancelled an override",
  "member.join": "Joined by invitation",
  "member.role": "Changed a member's role",
  "member.remove": "Removed a member",
  "invitation.create": "Invited someone",
  "invitation.resend": "Sent an invitation again",
  "invitation.withdraw": "Withdrew an invitation",
  "tariff.create": "Added a tariff",
  "tariff.update": "Changed a tariff",
  "tariff.delete": "Removed a tariff",
  "bill.create": "Entered a bill",
  "bill.update": "Changed a bill",
  "bill.delete": "Removed a bill",
  "alert.acknowledge": "Acknowledged an alert",
  "alert_rules.update": "Changed a house's alert rules",
  "alert_preferences.update": "Changed their alert e-mails",
  "site.summary": "Changed the daily summary time",
  "reading_import.create": "Imported sensor readings",
};

/** Names of changed fields on the activity page; others are spelled out from their key. */
export const AUDIT_FIELD_LABELS: Record<string, string> = {
  name: "Name",
  email: "E-mail",
  role: "Role",
  slug: "Address",
  siteName: "Site name",
  timeZone: "Time zone",
  currency: "Currency",
  mainsVoltage: "Mains voltage (V)",
  continuousLoadPercent: "Continuous-load margin (%)",
  lowLimitC: "Low safety limit (°C)",
  highLimitC: "High safety limit (°C)",
  applianceWatts: "Appliance (W)",
  ratedCurrentA: "Plug rating (A)",
  expiresAt: "Expires",
  kind: "Kind",
  validFrom: "Valid from",
  validUntil: "Valid until",
  standingChargePerDay: "Standing charge per day",
  taxPercent: "Tax (%)",
  rates: "Unit rates",
  startsOn: "From",
  endsOn: "To",
  label: "Label",
  billedKwh: "Billed kWh",
  billedAmount: "Billed amount",
};

/** How a tariff prices energy: one unit rate all week, or rates by weekday and time of day. */
export const TARIFF_KINDS = ["flat", "time_of_use"] as const;
export type TariffKind = (typeof TARIFF_KINDS)[number];

export const TARIFF_KIND_LABELS: Record<TariffKind, string> = {
  flat: "Flat rate",
  time_of_use: "Time of use",
};

/** Where a sensor hangs: in its house, or outside (the site's outside temperature). */
export const SENSOR_PLACEMENTS = ["inside", "outside"] as const;
export type SensorPlacement = (typeof SENSOR_PLACEMENTS)[number];

export const SENSOR_PLACEMENT_LABELS: Record<SensorPlacement, string> = {
  inside: "Inside the house",
  outside: "Outside (outdoor temperature)",
};

/**
 * How heating degree-days are counted: the UK's base 15.5 °C with the Met Office
 * max–min method, or the US base 65 °F with the daily mean.
 */
export const DEGREE_DAY_METHODS = ["uk_met_office", "us_mean"] as const;
export type DegreeDayMethod = (typeof DEGREE_DAY_METHODS)[number];

export const DEGREE_DAY_METHOD_LABELS: Record<DegreeDayMethod, string> = {
  uk_met_office: "Base 15.5 °C, from the day's lowest and highest (UK Met Office)",
  us_mean: "Base 65 °F, from the day's mean (US)",
};
