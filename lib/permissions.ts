// The one place that decides who may do what in a site. Pages, route handlers and
// server actions all ask `can` / `assertCan`.
import { AppError } from "./errors";

export const ROLES = ["owner", "grower", "helper", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export const ACTIONS = [
  "site.view",
  "site.edit",
  "members.view",
  "members.manage",
  "tariffs.manage",
  "houses.manage",
  "devices.manage",
  "schedules.manage",
  "overrides.create",
  "overrides.cancel",
  "alerts.view",
  "alerts.acknowledge",
  "alerts.manage",
  "readings.import",
  "history.view",
  "reports.view",
  "reports.export",
  "audit.view",
] as const;
export type Action = (typeof ACTIONS)[number];

const everyone: readonly Role[] = ROLES;

const allowed: Record<Action, readonly Role[]> = {
  "site.view": everyone,
  "site.edit": ["owner"],
  "members.view": ["owner", "grower"],
  "members.manage": ["owner"],
  "tariffs.manage": ["owner"],
  "houses.manage": ["owner", "grower"],
  "devices.manage": ["owner", "grower"],
  "schedules.manage": ["owner", "grower"],
  "overrides.create": ["owner", "grower", "helper"],
  "overrides.cancel": ["owner", "grower", "helper"],
  "alerts.view": everyone,
  "alerts.acknowledge": ["owner", "grower", "helper"],
  "alerts.manage": ["owner", "grower"],
  "readings.import": ["owner", "grower"],
  "history.view": everyone,
  "reports.view": everyone,
  "reports.export": ["owner", "viewer"],
  "audit.view": ["owner"],
};

export function can(role: Role | null | undefined, action: Action): boolean {
  return role != null && allowed[action].includes(role);
}

export function assertCan(role: Role, action: Action): void {
  if (!can(role, action)) {
    throw new AppError("forbidden", `Your role (${role}) does not allow this (${action}).`);
  }
}

export const ROLE_LABELS: Record<Role, { name: string; summary: string }> = {
  owner: { name: "Owner", summary: "Everything, including members, tariffs and exports" },
  grower: { name: "Grower", summary: "Schedules, bands, devices and overrides" },
  helper: { name: "Helper", summary: "Sees the state and switches plugs for a while" },
  viewer: { name: "Viewer", summary: "Read-only: dashboards, history and reports" },
};
