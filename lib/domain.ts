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

/** Why a plug is in its state: the decision's causes, and `resync` for a change the controller found on restart. */
export const SWITCH_CAUSES = ["safety", "override", "schedule", "default", "failsafe", "resync"] as const;
export type SwitchCause = (typeof SWITCH_CAUSES)[number];
