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
