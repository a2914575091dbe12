// Setting up a site through its handlers: houses' limits, plugs, sensors, device
// credentials and each person's °C/°F. The access table (access/setup.ts) holds the
// 401/404/403 checks; here are the happy paths, bad input, the roles and the audit.
import { and, desc, eq, inArray, like, notInArray } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { lookupDeviceSecret } from "@/db/device-credentials";
import { auditLog, deviceCredentials, houses, plugs, sensors, sites } from "@/db/schema";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import { loadConfig } from "@/controller/config";
import * as sitesRoute from "@/app/api/sites/route";
import * as siteRoutes from "@/app/api/sites/[siteId]/route";
import * as housesRoute from "@/app/api/sites/[siteId]/houses/route";
import * as houseRoute from "@/app/api/sites/[siteId]/houses/[houseId]/route";
import * as devicesRoute from "@/app/api/sites/[siteId]/devices/route";
import * as plugsRoute from "@/app/api/sites/[siteId]/plugs/route";
import * as plugRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/route";
import * as sensorsRoute from "@/app/api/sites/[siteId]/sensors/route";
import * as sensorRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/route";
import * as credentialRoute from "@/app/api/sites/[siteId]/devices/[kind]/[id]/credential/route";
import * as meSettingsRoute from "@/app/api/me/settings/route";
import { call, signIn, signUp, type Account } from "../support/http";
import { newHouse } from "./access/site";

const wakes = vi.hoisted(() => [] as { site: string; payload: unknown }[]);
vi.mock("@/lib/server/wake", () => ({
  wakeController: async (site: string, payload: unknown) => {
    wakes.push({ site, payload });
    return true;
  },
  setWakeBroker: async () => {},
}));

const siteId = DEMO_SITE.id;
const glass = demoId("house:glass");
const tunnel = demoId("house:tunnel");
const DEMO_HOUSES = [glass, tunnel, demoId("house:seedling")];
const cookies: Record<string, string> = {};
let outsider: Account;
let outsiderSite: string;
let serial = 0;

type Json = { error?: { code: string; message: string; fields?: Record<string, string> } } & Record<string, unknown>;
async function send(handler: unknown, method: string, params: Record<string, string>, body?: unknown, cookie = cookies.grower, path = "/x") {
  const response = await call(handler, { method, path, params, body, cookie });
  const json = (response.status === 204 ? {} : await response.json()) as Json;
  return { status: response.status, json };
}

const plugBody = (extra: Record<string, unknown> = {}) => ({
  name: "Bench heater",
  deviceId: `bench-heater-${++serial}`,
  houseId: glass,
  applianceKind: "heater",
  applianceWatts: 1500,
  ratedCurrentA: 13,
  ...extra,
});
const sensorBody = (extra: Record<string, unknown> = {}) => ({ name: "Bench air", deviceId: `bench-air-${++serial}`, houseId: glass, ...extra });

async function auditOf(entityId: string) {
  return getDb()
    .select({ action: auditLog.action, userId: auditLog.userId, before: auditLog.before, after: auditLog.after })
    .from(auditLog)
    .where(and(eq(auditLog.siteId, siteId), eq(auditLog.entityId, entityId)))
    .orderBy(desc(auditLog.id));
}

async function createPlug(extra: Record<string, unknown> = {}) {
  const r = await send(plugsRoute.POST, "POST", { siteId }, plugBody(extra));
  expect(r.status, JSON.stringify(r.json)).toBe(201);
  return r.json.plug as { id: string; deviceId: string; sensorId: string | null };
}

beforeAll(async () => {
  await seedDemo(getDb());
  for (const member of DEMO_MEMBERS) cookies[member.role] = await signIn(member.email, member.password);
  outsider = await signUp({ siteName: "Setup Test Plot" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: outsider.cookie });
  outsiderSite = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
});

beforeEach(() => {
  wakes.length = 0;
});

// The demo site is shared with the other test files: what these tests added to it goes again.
afterAll(async () => {
  const db = getDb();
  await db.delete(plugs).where(and(eq(plugs.siteId, siteId), like(plugs.deviceId, "bench-%")));
  await db.delete(sensors).where(and(eq(sensors.siteId, siteId), like(sensors.deviceId, "bench-%")));
  await db.delete(deviceCredentials).where(and(eq(deviceCredentials.siteId, siteId), like(deviceCredentials.deviceId, "bench-%")));
  await db.delete(houses).where(and(eq(houses.siteId, siteId), notInArray(houses.id, DEMO_HOUSES)));
  const left = await db.select({ id: houses.id }).from(houses).where(inArray(houses.id, DEMO_HOUSES));
  expect(left).toHaveLength(DEMO_HOUSES.length);
});

describe("a house's low and high limits", () => {
  it("a new house gets a 2 °C frost limit unless given", async () => {
    const r = await send(housesRoute.POST, "POST", { siteId }, { ...newHouse, name: "Limits default" });
    expect(r.status).toBe(201);
    expect(r.json.house).toMatchObject({ lowLimitC: 2, highLimitC: 35 });
  });

  it("refuses a low limit at or above the high limit, naming lowLimitC", async () => {
    const r = await send(housesRoute.POST, "POST", { siteId }, { ...newHouse, lowLimitC: 20, highLimitC: 20 });
    expect(r.status).toBe(400);
    expect(r.json.error!.fields).toHaveProperty("lowLimitC", "Low limit (frost) must be below the high limit (cut-out)");
  });

  it("refuses a low limit out of bounds, telling both units", async () => {
    const r = await send(housesRoute.POST, "POST", { siteId }, { ...newHouse, lowLimitC: -40 });
    expect(r.status).toBe(400);
    expect(r.json.error!.message).toBe("lowLimitC: Low limit must be at least -20 °C (-4 °F)");
  });

  it("checks a change against the stored house, and audits before and after", async () => {
    const created = await send(housesRoute.POST, "POST", { siteId }, { ...newHouse, name: "Limits change", highLimitC: 30 });
    const house = created.json.house as { id: string };
    const params = { siteId, houseId: house.id };
    const refused = await send(houseRoute.PATCH, "PATCH", params, { lowLimitC: 30 });
    expect(refused.status).toBe(400);
    expect(refused.json.error!.fields).toHaveProperty("lowLimitC");
    const changed = await send(houseRoute.PATCH, "PATCH", params, { lowLimitC: 4.5 });
    expect(changed.status).toBe(200);
    expect(changed.json.house).toMatchObject({ lowLimitC: 4.5, highLimitC: 30 });
    const [last] = await auditOf(house.id);
    expect(last).toMatchObject({ action: "house.update", before: { lowLimitC: 2 }, after: { lowLimitC: 4.5 } });
  });
});

describe("removing a house", () => {
  it("revokes the credentials of its plugs and sensors with it", async () => {
    const created = await send(housesRoute.POST, "POST", { siteId }, { ...newHouse, name: "Short-lived" });
    const houseId = (created.json.house as { id: string }).id;
    const plug = await createPlug({ houseId });
    const sensorMade = await send(sensorsRoute.POST, "POST", { siteId }, sensorBody({ houseId }));
    const sensor = sensorMade.json.sensor as { id: string };
    const names: string[] = [];
    for (const [kind, id] of [["plug", plug.id], ["sensor", sensor.id]]) {
      const issued = await send(credentialRoute.POST, "POST", { siteId, kind: kind!, id: id! });
      names.push(issued.json.username as string);
    }
    expect((await send(houseRoute.DELETE, "DELETE", { siteId, houseId })).status).toBe(204);
    for (const name of names) expect(await lookupDeviceSecret(getDb(), name)).toBeNull();
  });
});

describe("plugs", () => {
  it.each([
    ["owner", 201],
    ["grower", 201],
    ["helper", 403],
    ["viewer", 403],
  ])("a %s adding a plug gets %i", async (role, status) => {
    const r = await send(plugsRoute.POST, "POST", { siteId }, plugBody(), cookies[role]);
    expect(r.status).toBe(status);
  });

  it("adds a plug with its settings, audits it and wakes the site's controller for it", async () => {
    const body = plugBody({ sensorId: demoId("sensor:glass"), failsafe: "duty", failsafeDutyPercent: 25, minOnS: 300, leaseS: 600 });
    const r = await send(plugsRoute.POST, "POST", { siteId }, body);
    expect(r.status).toBe(201);
    const plug = r.json.plug as { id: string };
    expect(plug).toMatchObject({ deviceId: body.deviceId, sensorId: demoId("sensor:glass"), failsafe: "duty", failsafeDutyPercent: 25, minOnS: 300, minOffS: 180, leaseS: 600, retiredAt: null });
    const [entry] = await auditOf(plug.id);
    expect(entry).toMatchObject({ action: "plug.create", after: { deviceId: body.deviceId, applianceWatts: 1500 } });
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "device", plug: body.deviceId } }]);
  });

  it.each([
    ["a device id that breaks the topic rule", { deviceId: "Bench Heater!" }, "deviceId", /lower-case letters, digits or dashes/],
    ["a duty fail-safe without its percent", { failsafe: "duty" }, "failsafeDutyPercent", /On-for percent is required/],
    ["watts as text", { applianceWatts: "2kW" }, "applianceWatts", /must be a number/],
    ["a rating in hundredths", { ratedCurrentA: 12.55 }, "ratedCurrentA", /tenths/],
    ["a lease under a minute", { leaseS: 5 }, "leaseS", /at least 60 s/],
    // 3000 W / 230 V = 13.0 A, over 80 % of a 13 A plug (10.4 A): NEC 210.19(A)/210.20(A)'s margin.
    ["a load over the plug's continuous rating", { applianceWatts: 3000 }, "applianceWatts", /more than the plug may carry for hours \(80 % of its rating at 230 V\)/],
    ["a sensor in another house", { sensorId: demoId("sensor:tunnel") }, "sensorId", /the sensor must be in the plug’s house/],
    ["a house of another site", { houseId: "00000000-0000-4000-8000-000000000000" }, "houseId", /no such house in this site/],
  ])("refuses %s with a 400 naming the field, and adds nothing", async (_label, extra, field, message) => {
    const body = plugBody(extra);
    const r = await send(plugsRoute.POST, "POST", { siteId }, body);
    expect(r.status).toBe(400);
    expect(r.json.error!.fields).toHaveProperty(field);
    expect(r.json.error!.message).toMatch(message);
    expect(await getDb().select().from(plugs).where(and(eq(plugs.siteId, siteId), eq(plugs.deviceId, String(body.deviceId))))).toEqual([]);
    expect(wakes).toEqual([]);
  });

  it("a load exactly at the continuous limit is allowed", async () => {
    // 10.4 A (80 % of 13 A) × 230 V = 2392 W: at the limit is within it (checkLoad).
    await createPlug({ applianceWatts: 2392 });
  });

  it("refuses a device id already used in the site, plug or sensor, with a 409 naming what uses it", async () => {
    const taken = await send(plugsRoute.POST, "POST", { siteId }, plugBody({ deviceId: "glass-air" }));
    expect(taken.status).toBe(409);
    expect(taken.json.error!.message).toBe("Device id “glass-air” is already used by the sensor “Glasshouse air” in this site; choose another.");
    const plug = await createPlug();
    const again = await send(sensorsRoute.POST, "POST", { siteId }, sensorBody({ deviceId: plug.deviceId }));
    expect(again.status).toBe(409);
  });

  it("the same device id is free in another site", async () => {
    const houses = await send(housesRoute.POST, "POST", { siteId: outsiderSite }, newHouse, outsider.cookie);
    const houseId = (houses.json.house as { id: string }).id;
    const r = await send(plugsRoute.POST, "POST", { siteId: outsiderSite }, plugBody({ deviceId: "glass-heater", houseId }), outsider.cookie);
    expect(r.status).toBe(201);
  });

  it("checks a change against the stored plug: the load rule and the sensor's house", async () => {
    const plug = await createPlug({ sensorId: demoId("sensor:glass") });
    wakes.length = 0;
    const params = { siteId, plugId: plug.id };
    const heavy = await send(plugRoute.PATCH, "PATCH", params, { ratedCurrentA: 6 });
    expect(heavy.status).toBe(400);
    expect(heavy.json.error!.fields).toHaveProperty("applianceWatts");
    const moved = await send(plugRoute.PATCH, "PATCH", params, { houseId: tunnel });
    expect(moved.status).toBe(400);
    expect(moved.json.error!.fields).toHaveProperty("sensorId");
    const fixedId = await send(plugRoute.PATCH, "PATCH", params, { deviceId: "something-else" });
    expect(fixedId.status).toBe(400);
    expect(wakes).toEqual([]);

    const ok = await send(plugRoute.PATCH, "PATCH", params, { houseId: tunnel, sensorId: demoId("sensor:tunnel"), applianceWatts: 1200 });
    expect(ok.status).toBe(200);
    expect(ok.json.plug).toMatchObject({ houseId: tunnel, sensorId: demoId("sensor:tunnel"), applianceWatts: 1200 });
    const [entry] = await auditOf(plug.id);
    expect(entry).toMatchObject({
      action: "plug.update",
      before: { houseId: glass, sensorId: demoId("sensor:glass"), applianceWatts: 1500 },
      after: { houseId: tunnel, sensorId: demoId("sensor:tunnel"), applianceWatts: 1200 },
    });
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "device", plug: plug.deviceId } }]);
  });

  it("another site's plug is a 404 through one's own site", async () => {
    const r = await send(plugRoute.PATCH, "PATCH", { siteId: outsiderSite, plugId: demoId("plug:glass-heater") }, { name: "Mine now" }, outsider.cookie);
    expect(r.status).toBe(404);
  });

  it("retiring revokes its credential, keeps the row, and the controller no longer loads it", async () => {
    const plug = await createPlug();
    const params = { siteId, plugId: plug.id };
    const issued = await send(credentialRoute.POST, "POST", { siteId, kind: "plug", id: plug.id });
    expect(issued.status).toBe(201);
    const username = issued.json.username as string;
    expect(await lookupDeviceSecret(getDb(), username)).not.toBeNull();
    expect((await loadConfig(getDb(), new Date(), ["fernhollow"])).plugs.map((p) => p.id)).toContain(plug.id);

    const helper = await send(plugRoute.DELETE, "DELETE", params, undefined, cookies.helper);
    expect(helper.status).toBe(403);
    wakes.length = 0;
    const retired = await send(plugRoute.DELETE, "DELETE", params);
    expect(retired.status).toBe(200);
    expect((retired.json.plug as { retiredAt: string | null }).retiredAt).not.toBeNull();
    expect(await lookupDeviceSecret(getDb(), username)).toBeNull();
    expect((await loadConfig(getDb(), new Date(), ["fernhollow"])).plugs.map((p) => p.id)).not.toContain(plug.id);
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "device", plug: plug.deviceId } }]);
    const [entry] = await auditOf(plug.id);
    expect(entry).toMatchObject({ action: "plug.retire", before: { retiredAt: null }, after: { credentialsRevoked: 1 } });

    const listed = await send(devicesRoute.GET, "GET", { siteId }, undefined, cookies.viewer, `/api/sites/${siteId}/devices`);
    expect((listed.json.plugs as { id: string }[]).map((p) => p.id)).not.toContain(plug.id);
    const all = await send(devicesRoute.GET, "GET", { siteId }, undefined, cookies.viewer, `/api/sites/${siteId}/devices?retired=1`);
    expect((all.json.plugs as { id: string }[]).map((p) => p.id)).toContain(plug.id);
    const badQuery = await send(devicesRoute.GET, "GET", { siteId }, undefined, cookies.viewer, `/api/sites/${siteId}/devices?retired=yes`);
    expect(badQuery.status).toBe(400);

    for (const [handler, method, body, p] of [
      [plugRoute.DELETE, "DELETE", undefined, params],
      [plugRoute.PATCH, "PATCH", { name: "Back again" }, params],
      [credentialRoute.POST, "POST", undefined, { siteId, kind: "plug", id: plug.id }],
    ] as const) {
      const r = await send(handler, method, p, body);
      expect(r.status).toBe(409);
      expect(r.json.error!.message).toMatch(/is retired/);
    }
    const reuse = await send(plugsRoute.POST, "POST", { siteId }, plugBody({ deviceId: plug.deviceId }));
    expect(reuse.status).toBe(409);
    expect(reuse.json.error!.message).toMatch(/retired plug/);
  });

  it("the device list shows every member the plugs and sensors with presence", async () => {
    const r = await send(devicesRoute.GET, "GET", { siteId }, undefined, cookies.helper, `/api/sites/${siteId}/devices`);
    expect(r.status).toBe(200);
    const heater = (r.json.plugs as { deviceId: string }[]).find((p) => p.deviceId === "glass-heater");
    expect(heater).toMatchObject({ houseName: "Long Glasshouse", kind: "plug", online: expect.any(Boolean), retiredAt: null });
    expect((r.json.sensors as { deviceId: string }[]).map((s) => s.deviceId)).toEqual(expect.arrayContaining(["glass-air", "tunnel-air"]));
  });
});

describe("sensors", () => {
  it("adds, renames and retires a sensor, audited, revoking its credential", async () => {
    const created = await send(sensorsRoute.POST, "POST", { siteId }, sensorBody());
    expect(created.status).toBe(201);
    const sensor = created.json.sensor as { id: string; deviceId: string };
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "device" } }]);
    const params = { siteId, sensorId: sensor.id };
    const renamed = await send(sensorRoute.PATCH, "PATCH", params, { name: "Bench air, north" });
    expect(renamed.json.sensor).toMatchObject({ name: "Bench air, north" });
    const issued = await send(credentialRoute.POST, "POST", { siteId, kind: "sensor", id: sensor.id });
    const retired = await send(sensorRoute.DELETE, "DELETE", params);
    expect(retired.status).toBe(200);
    expect(await lookupDeviceSecret(getDb(), issued.json.username as string)).toBeNull();
    expect((await loadConfig(getDb(), new Date(), ["fernhollow"])).sensors.map((s) => s.id)).not.toContain(sensor.id);
    expect((await auditOf(sensor.id)).map((a) => a.action)).toEqual(["sensor.retire", "credential.issue", "sensor.update", "sensor.create"]);
  });

  it("refuses to retire or move a sensor that plugs follow, naming them", async () => {
    const params = { siteId, sensorId: demoId("sensor:glass") };
    const retire = await send(sensorRoute.DELETE, "DELETE", params);
    expect(retire.status).toBe(409);
    expect(retire.json.error!.message).toMatch(/“Glasshouse heater”/);
    const move = await send(sensorRoute.PATCH, "PATCH", params, { houseId: tunnel });
    expect(move.status).toBe(409);
  });

  it("places a sensor inside by default, outside when asked, and changes it only when sent", async () => {
    const inside = await send(sensorsRoute.POST, "POST", { siteId }, sensorBody());
    expect(inside.json.sensor).toMatchObject({ placement: "inside" });
    const outside = await send(sensorsRoute.POST, "POST", { siteId }, sensorBody({ placement: "outside" }));
    expect(outside.status).toBe(201);
    const params = { siteId, sensorId: (outside.json.sensor as { id: string }).id };
    expect((await send(sensorRoute.PATCH, "PATCH", params, { name: "Yard, east" })).json.sensor).toMatchObject({ name: "Yard, east", placement: "outside" });
    const bad = await send(sensorRoute.PATCH, "PATCH", params, { placement: "roof" });
    expect(bad.status).toBe(400);
    expect(bad.json.error!.fields).toHaveProperty("placement");
    expect((await send(sensorRoute.GET, "GET", params)).json.sensor).toMatchObject({ name: "Yard, east", placement: "outside" });
    const moved = await send(sensorRoute.PATCH, "PATCH", params, { placement: "inside" });
    expect(moved.json.sensor).toMatchObject({ placement: "inside" });
    const [audit] = await auditOf(params.sensorId);
    expect(audit).toMatchObject({ action: "sensor.update", before: { placement: "outside" }, after: { placement: "inside" } });
  });

  it("refuses a bad device id and a helper", async () => {
    expect((await send(sensorsRoute.POST, "POST", { siteId }, sensorBody({ deviceId: "-edge-" }))).status).toBe(400);
    expect((await send(sensorsRoute.POST, "POST", { siteId }, sensorBody(), cookies.helper)).status).toBe(403);
  });
});

describe("device credentials", () => {
  it("revoking stops the secret, is audited and wakes; a second revoke is a 409", async () => {
    const plug = await createPlug();
    const params = { siteId, kind: "plug", id: plug.id };
    const issued = await send(credentialRoute.POST, "POST", params);
    const username = issued.json.username as string;
    wakes.length = 0;
    expect((await send(credentialRoute.DELETE, "DELETE", params, undefined, cookies.helper)).status).toBe(403);
    const revoked = await send(credentialRoute.DELETE, "DELETE", params);
    expect(revoked.status).toBe(200);
    expect(await lookupDeviceSecret(getDb(), username)).toBeNull();
    const [row] = await getDb().select().from(deviceCredentials).where(eq(deviceCredentials.username, username));
    expect(row!.revokedAt).not.toBeNull();
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "device", plug: plug.deviceId } }]);
    expect((await auditOf(plug.id)).map((a) => a.action).slice(0, 2)).toEqual(["credential.revoke", "credential.issue"]);
    const again = await send(credentialRoute.DELETE, "DELETE", params);
    expect(again.status).toBe(409);
    expect(again.json.error!.message).toMatch(/no active credential/);
  });
});

describe("each person's own settings", () => {
  it("stores °F for the person alone and reads it back", async () => {
    const me = await signUp();
    const put = await send(meSettingsRoute.PUT, "PUT", {}, { temperatureUnit: "f" }, me.cookie);
    expect(put.status).toBe(200);
    expect(put.json.settings).toEqual({ temperatureUnit: "f" });
    expect((await send(meSettingsRoute.GET, "GET", {}, undefined, me.cookie)).json.settings).toEqual({ temperatureUnit: "f" });
    expect((await send(meSettingsRoute.GET, "GET", {}, undefined, cookies.viewer)).json.settings).toEqual({ temperatureUnit: "c" });
    const back = await send(meSettingsRoute.PUT, "PUT", {}, { temperatureUnit: "c" }, me.cookie);
    expect(back.json.settings).toEqual({ temperatureUnit: "c" });
  });

  it("refuses an unknown unit, naming the field", async () => {
    const r = await send(meSettingsRoute.PUT, "PUT", {}, { temperatureUnit: "kelvin" }, cookies.viewer);
    expect(r.status).toBe(400);
    expect(r.json.error!.message).toBe("temperatureUnit: Temperature unit must be c or f");
  });
});

describe("site settings", () => {
  it("the owner's change is audited, and wakes the controller only when a control field changes", async () => {
    const [site] = await getDb().select().from(sites).where(eq(sites.id, siteId));
    const renamed = await send(siteRoutes.PATCH, "PATCH", { siteId }, { name: site!.name }, cookies.owner);
    expect(renamed.status).toBe(200);
    expect(wakes).toEqual([]);
    const margin = await send(siteRoutes.PATCH, "PATCH", { siteId }, { continuousLoadPercent: 80, mainsVoltage: 230 }, cookies.owner);
    expect(margin.status).toBe(200);
    expect(wakes).toEqual([{ site: "fernhollow", payload: { reason: "site" } }]);
    const [entry] = await auditOf(siteId);
    expect(entry).toMatchObject({ action: "site.update", after: { continuousLoadPercent: 80, mainsVoltage: 230 } });
    expect((await send(siteRoutes.PATCH, "PATCH", { siteId }, { mainsVoltage: 120 }, cookies.grower)).status).toBe(403);
  });
});
