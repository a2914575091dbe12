// Wrong input to every handler that takes input: a 400 naming the field, never a 500.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import * as sitesRoute from "@/app/api/sites/route";
import * as siteRoute from "@/app/api/sites/[siteId]/route";
import * as housesRoute from "@/app/api/sites/[siteId]/houses/route";
import * as houseRoute from "@/app/api/sites/[siteId]/houses/[houseId]/route";
import { call, signIn } from "../support/http";

let owner: string;
beforeAll(async () => {
  await seedDemo(getDb());
  const member = DEMO_MEMBERS.find((m) => m.role === "owner")!;
  owner = await signIn(member.email, member.password);
});

const site = { siteId: DEMO_SITE.id };
const house = { siteId: DEMO_SITE.id, houseId: demoId("house:glass") };
const validHouse = {
  name: "Cold Frame Row",
  kind: "other",
  lengthM: 3,
  widthM: 1,
  eaveHeightM: 0.5,
  ridgeHeightM: 0.8,
  glazing: "single_rigid_plastic",
};

type Bad = { label: string; body: unknown; field: string };
type Target = { name: string; handler: unknown; method: string; params: Record<string, string>; bad: Bad[] };

const long = "x".repeat(5000);
const targets: Target[] = [
  {
    name: "POST /api/sites",
    handler: sitesRoute.POST,
    method: "POST",
    params: {},
    bad: [
      { label: "missing fields", body: {}, field: "siteName" },
      { label: "wrong type", body: { siteName: 42, timeZone: "Europe/London", currency: "GBP" }, field: "siteName" },
      { label: "oversized string", body: { siteName: long, timeZone: "Europe/London", currency: "GBP" }, field: "siteName" },
      { label: "unknown time zone", body: { siteName: "Plot", timeZone: "Europe/Atlantis", currency: "GBP" }, field: "timeZone" },
      { label: "unknown currency", body: { siteName: "Plot", timeZone: "Europe/London", currency: "XXY" }, field: "currency" },
    ],
  },
  {
    name: "PATCH /api/sites/[siteId]",
    handler: siteRoute.PATCH,
    method: "PATCH",
    params: site,
    bad: [
      { label: "wrong type", body: { mainsVoltage: "lots" }, field: "mainsVoltage" },
      { label: "out of range", body: { mainsVoltage: 9000 }, field: "mainsVoltage" },
      { label: "oversized string", body: { name: long }, field: "name" },
      { label: "empty name", body: { name: "   " }, field: "name" },
      { label: "continuous-load margin below 50 %", body: { continuousLoadPercent: 40 }, field: "continuousLoadPercent" },
      { label: "continuous-load margin over 100 %", body: { continuousLoadPercent: 101 }, field: "continuousLoadPercent" },
      { label: "continuous-load margin not whole", body: { continuousLoadPercent: 82.5 }, field: "continuousLoadPercent" },
    ],
  },
  {
    name: "POST /api/sites/[siteId]/houses",
    handler: housesRoute.POST,
    method: "POST",
    params: site,
    bad: [
      { label: "missing fields", body: { name: "Only a name" }, field: "kind" },
      { label: "wrong type", body: { ...validHouse, lengthM: { metres: 3 } }, field: "lengthM" },
      { label: "unknown kind", body: { ...validHouse, kind: "castle" }, field: "kind" },
      { label: "oversized string", body: { ...validHouse, name: long }, field: "name" },
      { label: "ridge below eaves", body: { ...validHouse, ridgeHeightM: 0.2 }, field: "ridgeHeightM" },
      { label: "negative size", body: { ...validHouse, widthM: -4 }, field: "widthM" },
    ],
  },
  {
    name: "PATCH /api/sites/[siteId]/houses/[houseId]",
    handler: houseRoute.PATCH,
    method: "PATCH",
    params: house,
    bad: [
      { label: "wrong type", body: { highLimitC: true }, field: "highLimitC" },
      { label: "oversized notes", body: { notes: long }, field: "notes" },
      { label: "ridge below eaves", body: { ridgeHeightM: 1 }, field: "ridgeHeightM" },
    ],
  },
];

describe.each(targets)("$name", (target) => {
  it.each(target.bad)("$label → 400 naming $field", async ({ body, field }) => {
    const response = await call(target.handler, { method: target.method, path: "/x", params: target.params, body, cookie: owner });
    expect(response.status).toBe(400);
    const json = (await response.json()) as { error: { code: string; message: string; fields: Record<string, string> } };
    expect(json.error.code).toBe("bad_input");
    expect(json.error.message).toContain(field);
    expect(Object.keys(json.error.fields)).toContain(field);
  });

  it.each([
    ["malformed JSON", "{ not json"],
    ["a JSON array", "[1,2,3]"],
    ["JSON null", "null"],
    ["an empty body", ""],
  ])("%s → 400", async (_label, raw) => {
    const response = await call(target.handler, { method: target.method, path: "/x", params: target.params, body: raw, cookie: owner });
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: { message: string } }).error.message).toMatch(/body/);
  });

  it("a body over 64 KiB → 413", async () => {
    const response = await call(target.handler, {
      method: target.method,
      path: "/x",
      params: target.params,
      body: JSON.stringify({ notes: "y".repeat(70_000) }),
      cookie: owner,
    });
    expect(response.status).toBe(413);
  });
});

describe("ids in the path", () => {
  it.each([
    ["GET", siteRoute.GET, { siteId: "not-a-uuid" }, "siteId"],
    ["GET", housesRoute.GET, { siteId: "1; DROP TABLE sites" }, "siteId"],
    ["GET", houseRoute.GET, { siteId: DEMO_SITE.id, houseId: "42" }, "houseId"],
  ] as const)("%s with a malformed %s → 400", async (method, handler, params, field) => {
    const response = await call(handler, { method, path: "/x", params: { ...params }, cookie: owner });
    expect(response.status).toBe(400);
    expect(((await response.json()) as { error: { fields: Record<string, string> } }).error.fields).toHaveProperty(field);
  });

  it("a well-formed id that matches nothing → 404", async () => {
    const response = await call(siteRoute.GET, { path: "/x", params: { siteId: randomUUID() }, cookie: owner });
    expect(response.status).toBe(404);
  });
});
