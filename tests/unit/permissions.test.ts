import { describe, expect, it } from "vitest";
import { ACTIONS, ROLES, assertCan, can, type Action, type Role } from "@/lib/permissions";
import { AppError } from "@/lib/errors";

// The expected table is written out here, not derived from the module, so a change to
// who may do what has to be made twice on purpose.
const Y = true;
const N = false;
const expected: Record<Action, [owner: boolean, grower: boolean, helper: boolean, viewer: boolean]> = {
  "site.view": [Y, Y, Y, Y],
  "site.edit": [Y, N, N, N],
  "members.view": [Y, Y, N, N],
  "members.manage": [Y, N, N, N],
  "tariffs.manage": [Y, N, N, N],
  "houses.manage": [Y, Y, N, N],
  "devices.manage": [Y, Y, N, N],
  "schedules.manage": [Y, Y, N, N],
  "overrides.create": [Y, Y, Y, N],
  "overrides.cancel": [Y, Y, Y, N],
  "alerts.view": [Y, Y, Y, Y],
  "alerts.acknowledge": [Y, Y, Y, N],
  "alerts.manage": [Y, Y, N, N],
  "readings.import": [Y, Y, N, N],
  "history.view": [Y, Y, Y, Y],
  "reports.view": [Y, Y, Y, Y],
  "reports.export": [Y, N, N, Y],
  "audit.view": [Y, N, N, N],
};

describe("permissions", () => {
  it("the table covers every action", () => {
    expect(Object.keys(expected).sort()).toEqual([...ACTIONS].sort());
  });

  const cases = ACTIONS.flatMap((action) => ROLES.map((role, i) => ({ role, action, allowed: expected[action][i]! })));

  it.each(cases)("$role may $action: $allowed", ({ role, action, allowed }) => {
    expect(can(role, action)).toBe(allowed);
    if (allowed) expect(() => assertCan(role, action)).not.toThrow();
    else {
      const error = (() => {
        try {
          assertCan(role, action);
        } catch (e) {
          return e;
        }
      })();
      expect(error).toBeInstanceOf(AppError);
      expect((error as AppError).status).toBe(403);
    }
  });

  it("nobody without a role may do anything", () => {
    for (const action of ACTIONS) {
      expect(can(null, action)).toBe(false);
      expect(can(undefined, action)).toBe(false);
      expect(can("gardener" as Role, action)).toBe(false);
    }
  });
});
