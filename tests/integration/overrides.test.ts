// The override handlers: each duration, bad input with its message, who may do it,
// another site's plug, one override in force per plug, and the audit trail.
import { beforeAll, describe, expect, it } from "vitest";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, memberships, overrides, plugs } from "@/db/schema";
import { toLocal } from "@/lib/schedule";
import * as overridesRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/route";
import * as overrideRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/[overrideId]/route";
import * as sitesRoute from "@/app/api/sites/route";
import { createControlSite, type ControlSite } from "../support/control-site";
import { call, signUp, type Account } from "../support/http";

let site: ControlSite;
const people: Record<"owner" | "grower" | "helper" | "viewer", Account> = {} as never;
const MIN = 60_000;

beforeAll(async () => {
  const db = getDb();
  site = await createControlSite(db);
  for (const role of ["owner", "grower", "helper", "viewer"] as const) {
    people[role] = await signUp({ name: `Test ${role}` });
    await db.insert(memberships).values({ siteId: site.siteId, userId: people[role].userId, role });
  }
});

const params = (plugId = site.heaterId) => ({ siteId: site.siteId, plugId });

type Answer = {
  override: { id: string; stopsAt: string; cancelled: string[] };
  error: { code: string; message: string; fields?: Record<string, string> };
};

async function press(body: unknown, who: Account = people.helper, plugId = site.heaterId) {
  const response = await call(overridesRoute.POST, { method: "POST", path: "/x", params: params(plugId), body, cookie: who.cookie });
  return { status: response.status, json: (await response.json()) as Answer };
}

async function stored(id: string) {
  const [row] = await getDb().select().from(overrides).where(eq(overrides.id, id));
  return row!;
}

describe("POST …/plugs/[plugId]/overrides", () => {
  it.each([
    ["30m", 30],
    ["1h", 60],
    ["3h", 180],
  ])("overrides for %s: the end is that long after the start", async (duration, minutes) => {
    const { status, json } = await press({ on: false, duration, reason: "Venting after spraying" });
    expect(status).toBe(201);
    const row = await stored(json.override.id);
    expect(row).toMatchObject({ on: false, untilNextChange: false, reason: "Venting after spraying", userId: people.helper.userId });
    expect(row.endsAt!.getTime() - row.startsAt.getTime()).toBe(minutes * MIN);
  });

  it("until the next schedule change: stored without an end, and the answer says when that is", async () => {
    const { status, json } = await press({ on: true, duration: "next_change" });
    expect(status).toBe(201);
    const row = await stored(json.override.id);
    expect(row).toMatchObject({ on: true, endsAt: null, untilNextChange: true, reason: "" });
    // The heater's window is daily from 00:00 for 24 h (tests/support/control-site.ts): it changes at the next local midnight.
    expect(toLocal(new Date(json.override.stopsAt), "Europe/London").slice(11)).toBe("00:00:00");
  });

  it("until the next schedule change is refused for a plug without a schedule", async () => {
    const { status, json } = await press({ on: true, duration: "next_change" }, people.helper, site.lightId);
    expect(status).toBe(400);
    expect(json.error.message).toMatch(/no schedule change coming/);
  });

  it("until a chosen local time in the site's zone", async () => {
    const target = new Date(Date.now() + 2 * 3600_000);
    const local = toLocal(target, "Europe/London").slice(0, 16);
    const { status, json } = await press({ on: true, duration: "until", until: local });
    expect(status).toBe(201);
    const row = await stored(json.override.id);
    expect(toLocal(row.endsAt!, "Europe/London").slice(0, 16)).toBe(local);
    expect(Math.abs(row.endsAt!.getTime() - target.getTime())).toBeLessThan(MIN);
  });

  it.each([
    [{ on: true, duration: "until", until: toLocal(new Date(Date.now() - 3600_000), "Europe/London").slice(0, 16) }, "until", /at least a minute from now/],
    [{ on: true, duration: "until", until: toLocal(new Date(Date.now() + 8 * 24 * 3600_000), "Europe/London").slice(0, 16) }, "until", /within 7 days/],
    [{ on: true, duration: "until" }, "until", /Choose the time the override ends/],
    [{ on: true, duration: "until", until: "tomorrow at five" }, "until", /date and time such as/],
    [{ on: true, duration: "1h", until: "2030-01-01T10:00" }, "until", /only with/],
    [{ on: true, duration: "2h" }, "duration", /Choose how long/],
    [{ on: "yes", duration: "1h" }, "on", /Choose on or off/],
    [{ on: true, duration: "1h", reason: "x".repeat(281) }, "reason", /at most 280 characters/],
  ])("refuses %j naming the field, and changes nothing", async (body, field, message) => {
    const before = await getDb().select().from(overrides).where(eq(overrides.plugId, site.heaterId));
    const { status, json } = await press(body);
    expect(status).toBe(400);
    expect(json.error.code).toBe("bad_input");
    expect(json.error.message).toMatch(message);
    expect(Object.keys(json.error.fields ?? {})).toContain(field);
    expect(await getDb().select().from(overrides).where(eq(overrides.plugId, site.heaterId))).toEqual(before);
  });

  it("owner, grower and helper may override; a viewer is refused (403)", async () => {
    for (const role of ["owner", "grower", "helper"] as const) {
      expect((await press({ on: true, duration: "30m" }, people[role])).status).toBe(201);
    }
    const viewer = await press({ on: true, duration: "30m" }, people.viewer);
    expect(viewer.status).toBe(403);
    expect(viewer.json.error.code).toBe("forbidden");
  });

  it("a plug of another site is a 404, even to that site's own member", async () => {
    const elsewhere = await signUp({ siteName: "Other Plot" });
    const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: elsewhere.cookie });
    const ownSite = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
    const through = await call(overridesRoute.POST, {
      method: "POST",
      path: "/x",
      params: { siteId: ownSite, plugId: site.heaterId },
      body: { on: true, duration: "1h" },
      cookie: elsewhere.cookie,
    });
    expect(through.status).toBe(404);
  });

  it("a new override ends the one in force, in the audit log with before and after", async () => {
    const first = await press({ on: true, duration: "3h", reason: "Cold night" }, people.grower);
    const second = await press({ on: false, duration: "30m", reason: "Door open" }, people.helper);
    expect(second.json.override.cancelled).toEqual([first.json.override.id]);
    const earlier = await stored(first.json.override.id);
    expect(earlier.cancelledBy).toBe(people.helper.userId);
    expect(earlier.cancelledAt).not.toBeNull();
    const open = await getDb().select().from(overrides).where(and(eq(overrides.plugId, site.heaterId)));
    const now = Date.now();
    expect(open.filter((o) => o.cancelledAt === null && (o.endsAt === null || o.endsAt.getTime() > now)).map((o) => o.id)).toEqual([
      second.json.override.id,
    ]);
    const trail = await getDb()
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.siteId, site.siteId), eq(auditLog.entityType, "override")))
      .orderBy(asc(auditLog.id));
    const cancel = trail.find((t) => t.action === "override.cancel" && t.entityId === first.json.override.id)!;
    expect(cancel.userId).toBe(people.helper.userId);
    expect((cancel.before as { cancelledAt?: unknown }).cancelledAt).toBeUndefined();
    expect((cancel.after as { cancelledAt: unknown }).cancelledAt).not.toBeNull();
    const create = trail.find((t) => t.action === "override.create" && t.entityId === second.json.override.id)!;
    // Named by its plug, as the activity page shows it.
    expect(create.after).toMatchObject({ name: "Heater", on: false, reason: "Door open" });
  });

  it("a retired plug cannot be overridden (409)", async () => {
    await getDb().update(plugs).set({ retiredAt: new Date() }).where(eq(plugs.id, site.lightId));
    const { status, json } = await press({ on: true, duration: "1h" }, people.owner, site.lightId);
    await getDb().update(plugs).set({ retiredAt: null }).where(eq(plugs.id, site.lightId));
    expect(status).toBe(409);
    expect(json.error.message).toMatch(/retired/);
  });
});

describe("DELETE …/overrides/[overrideId] and GET …/overrides", () => {
  it("cancels the override in force once; a second time is a 409, an unknown one a 404; the list says who did what", async () => {
    const { json } = await press({ on: true, duration: "1h", reason: "Frost tonight" }, people.grower);
    const id = json.override.id as string;
    const del = (who: Account, overrideId = id) =>
      call(overrideRoute.DELETE, { method: "DELETE", path: "/x", params: { ...params(), overrideId }, cookie: who.cookie });
    expect((await del(people.viewer)).status).toBe(403);
    expect((await del(people.helper)).status).toBe(200);
    const again = await del(people.helper);
    expect(again.status).toBe(409);
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/already been cancelled/);
    expect((await del(people.helper, "00000000-0000-4000-8000-000000000000")).status).toBe(404);
    expect((await stored(id)).cancelledBy).toBe(people.helper.userId);

    const list = await call(overridesRoute.GET, { path: "/x", params: params(), cookie: people.viewer.cookie });
    expect(list.status).toBe(200);
    const panel = (await list.json()) as { plug: { name: string; houseName: string }; active: unknown; recent: Record<string, unknown>[] };
    expect(panel.plug).toMatchObject({ name: "Heater", houseName: "Test house" });
    expect(panel.active).toBeNull();
    expect(panel.recent[0]).toMatchObject({ id, on: true, reason: "Frost tonight", byName: "Test grower", cancelledByName: "Test helper", active: false });
    expect(panel.recent[0]!.stopsAt).toBe(panel.recent[0]!.cancelledAt);
  });
});
