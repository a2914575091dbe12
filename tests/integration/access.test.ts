// Who may reach which route handler: every handler under app/api is listed here, and
// a test fails when one is added without being listed.
import { readdirSync, statSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, deviceCredentials, houses, sites } from "@/db/schema";
import { verifyDeviceSecret } from "@/lib/server/device-secrets";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import * as sitesRoute from "@/app/api/sites/route";
import * as siteRoute from "@/app/api/sites/[siteId]/route";
import * as housesRoute from "@/app/api/sites/[siteId]/houses/route";
import * as houseRoute from "@/app/api/sites/[siteId]/houses/[houseId]/route";
import * as credentialRoute from "@/app/api/sites/[siteId]/devices/[kind]/[id]/credential/route";
import { call, signIn, signUp, type Account } from "../support/http";
import type { Ids, RouteCase } from "./access/case";
import { newHouse } from "./access/site";

/** Every feature's route cases (tests/integration/access/*.ts, each exporting `cases`). */
const routes: RouteCase[] = Object.values(
  import.meta.glob<{ cases?: RouteCase[] }>("./access/*.ts", { eager: true }),
).flatMap((mod) => mod.cases ?? []);

/** Handlers that are public by design, and what guards them instead. */
const PUBLIC = new Set(["app/api/auth/[...all]/route.ts", "app/api/health/route.ts"]);

function routeFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return routeFiles(full);
    return name === "route.ts" ? [full] : [];
  });
}

const demo: Ids = {
  siteId: DEMO_SITE.id,
  houseId: demoId("house:glass"),
  plugId: demoId("plug:glass-heater"),
  sensorId: demoId("sensor:glass"),
};
const cookies: Record<string, string> = {};
let outsider: Account;
let outsiderSite: string;

beforeAll(async () => {
  await seedDemo(getDb());
  for (const member of DEMO_MEMBERS) cookies[member.role] = await signIn(member.email, member.password);
  outsider = await signUp({ siteName: "Elsewhere Allotment" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: outsider.cookie });
  outsiderSite = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
});

describe("route handler coverage", () => {
  it("lists every exported method of every route handler", async () => {
    const root = process.cwd();
    for (const file of routeFiles(path.join(root, "app/api"))) {
      const rel = path.relative(root, file);
      if (PUBLIC.has(rel)) continue;
      const mod = (await import(/* @vite-ignore */ file)) as Record<string, unknown>;
      const methods = Object.keys(mod).filter((k) => /^(GET|POST|PUT|PATCH|DELETE)$/.test(k));
      for (const method of methods) {
        expect(routes.some((r) => r.file === rel && r.method === method), `${method} ${rel} is not in the access table`).toBe(true);
      }
    }
  });
});

describe.each(routes)("$method $file", (route) => {
  it("asks for a session (401)", async () => {
    const response = await call(route.handler, { method: route.method, path: route.path(demo), params: route.params(demo), body: route.body });
    expect(response.status).toBe(401);
    expect(((await response.json()) as { error: { code: string } }).error.code).toBe("unauthenticated");
  });

  if (route.siteScoped) {
    it("hides another site from a non-member (404), and changes nothing there", async () => {
      const before = await getDb().select().from(houses).where(eq(houses.siteId, DEMO_SITE.id));
      const response = await call(route.handler, {
        method: route.method,
        path: route.path(demo),
        params: route.params(demo),
        body: route.body,
        cookie: outsider.cookie,
      });
      expect(response.status).toBe(404);
      expect(await getDb().select().from(houses).where(eq(houses.siteId, DEMO_SITE.id))).toEqual(before);
    });

    if ([demo.houseId, demo.plugId, demo.sensorId].some((id) => route.path(demo).includes(id))) {
      it("does not reach another site's house through one's own site (404)", async () => {
        const ids = { ...demo, siteId: outsiderSite };
        const response = await call(route.handler, {
          method: route.method,
          path: route.path(ids),
          params: route.params(ids),
          body: route.body,
          cookie: outsider.cookie,
        });
        expect(response.status).toBe(404);
      });
    }
  }

  if (route.siteScoped && route.write) {
    it("refuses a viewer (403) and changes nothing", async () => {
      const db = getDb();
      const [siteBefore] = await db.select().from(sites).where(eq(sites.id, DEMO_SITE.id));
      const housesBefore = await db.select().from(houses).where(eq(houses.siteId, DEMO_SITE.id));
      const response = await call(route.handler, {
        method: route.method,
        path: route.path(demo),
        params: route.params(demo),
        body: route.body,
        cookie: cookies.viewer,
      });
      expect(response.status).toBe(403);
      expect(((await response.json()) as { error: { code: string } }).error.code).toBe("forbidden");
      expect((await db.select().from(sites).where(eq(sites.id, DEMO_SITE.id)))[0]).toEqual(siteBefore);
      expect(await db.select().from(houses).where(eq(houses.siteId, DEMO_SITE.id))).toEqual(housesBefore);
    });
  }
});

describe("what each role may change", () => {
  it("a grower adds, changes and removes a house, and each change is in the audit log", async () => {
    const created = await call(housesRoute.POST, {
      method: "POST",
      path: `/api/sites/${DEMO_SITE.id}/houses`,
      params: { siteId: DEMO_SITE.id },
      body: newHouse,
      cookie: cookies.grower,
    });
    expect(created.status).toBe(201);
    const { house } = (await created.json()) as { house: { id: string; name: string; lengthM: number } };
    expect(house).toMatchObject({ name: "Test Lean-to", lengthM: 4 });
    const ids = { siteId: DEMO_SITE.id, houseId: house.id };

    const changed = await call(houseRoute.PATCH, { method: "PATCH", path: "/x", params: ids, body: { widthM: 3 }, cookie: cookies.grower });
    expect(changed.status).toBe(200);
    expect(((await changed.json()) as { house: { widthM: number } }).house.widthM).toBe(3);

    const helper = await call(houseRoute.DELETE, { method: "DELETE", path: "/x", params: ids, cookie: cookies.helper });
    expect(helper.status).toBe(403);

    const removed = await call(houseRoute.DELETE, { method: "DELETE", path: "/x", params: ids, cookie: cookies.grower });
    expect(removed.status).toBe(204);
    const gone = await call(houseRoute.GET, { path: "/x", params: ids, cookie: cookies.grower });
    expect(gone.status).toBe(404);

    const trail = await getDb()
      .select({ action: auditLog.action })
      .from(auditLog)
      .where(and(eq(auditLog.siteId, DEMO_SITE.id), eq(auditLog.entityId, house.id)));
    expect(trail.map((t) => t.action)).toEqual(["house.create", "house.update", "house.delete"]);
  });

  it("a grower issues a device's MQTT secret; only its hash is stored, and a bad kind is a 400", async () => {
    const params = { siteId: DEMO_SITE.id, kind: "plug", id: demoId("plug:glass-fan") };
    const response = await call(credentialRoute.POST, { method: "POST", path: "/x", params, cookie: cookies.grower });
    expect(response.status).toBe(201);
    const body = (await response.json()) as { username: string; secret: string };
    expect(body.username).toBe("fernhollow:plug:glass-fan");
    const [row] = await getDb().select().from(deviceCredentials).where(eq(deviceCredentials.username, body.username));
    expect(row!.secretHash).not.toContain(body.secret);
    expect(verifyDeviceSecret(body.secret, row!.secretHash)).toBe(true);
    const bad = await call(credentialRoute.POST, { method: "POST", path: "/x", params: { ...params, kind: "toaster" }, cookie: cookies.grower });
    expect(bad.status).toBe(400);
  });

  it("only the owner changes the site's settings", async () => {
    const grower = await call(siteRoute.PATCH, { method: "PATCH", path: "/x", params: { siteId: DEMO_SITE.id }, body: { mainsVoltage: 240 }, cookie: cookies.grower });
    expect(grower.status).toBe(403);
    const owner = await call(siteRoute.PATCH, { method: "PATCH", path: "/x", params: { siteId: DEMO_SITE.id }, body: { mainsVoltage: 230 }, cookie: cookies.owner });
    expect(owner.status).toBe(200);
  });

  it("every member sees the houses; the list holds the demo's three", async () => {
    for (const role of ["owner", "grower", "helper", "viewer"]) {
      const response = await call(housesRoute.GET, { path: "/x", params: { siteId: DEMO_SITE.id }, cookie: cookies[role] });
      expect(response.status).toBe(200);
      const names = ((await response.json()) as { houses: { name: string }[] }).houses.map((h) => h.name);
      expect(names).toEqual(expect.arrayContaining(["Long Glasshouse", "Orchard Tunnel", "Seedling House"]));
    }
  });
});
