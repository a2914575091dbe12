// The one order of a site-scoped handler: parse (400) → session (401) → the site and
// the row it is about (404) → permission (403) → the handler → the wake-up.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { getDb } from "@/db/client";
import { requireHouse } from "@/db/queries/houses";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import { recordId } from "@/lib/schemas/common";
import { siteRoute } from "@/lib/server/site-route";
import { setWakeBroker } from "@/lib/server/wake";
import { call, signIn, signUp, type Account } from "../support/http";

const steps: string[] = [];
const probe = siteRoute({
  params: z.object({ siteId: recordId("site"), houseId: recordId("house") }),
  body: z.object({ note: z.string().max(10) }),
  action: "houses.manage",
  load: async ({ site, params }) => {
    steps.push("load");
    return requireHouse({ siteId: site.id, houseId: params.houseId });
  },
  handle: async ({ loaded, body }) => {
    steps.push("handle");
    return Response.json({ house: loaded.name, note: body.note });
  },
  wakes: () => {
    steps.push("wake");
    return null;
  },
});

const house = { siteId: DEMO_SITE.id, houseId: demoId("house:glass") };
const goodBody = { note: "ok" };
const cookies: Record<string, string> = {};
let outsider: Account;

beforeAll(async () => {
  await seedDemo(getDb());
  await setWakeBroker(null);
  for (const member of DEMO_MEMBERS) cookies[member.role] = await signIn(member.email, member.password);
  outsider = await signUp({ siteName: "Order Test Plot" });
});

async function send(params: Record<string, string>, body: unknown, cookie?: string) {
  steps.length = 0;
  const response = await call(probe, { method: "POST", path: "/x", params, body, cookie });
  const json = (await response.json()) as { error?: { code: string; fields?: Record<string, string> } };
  return { status: response.status, code: json.error?.code, fields: json.error?.fields, steps: [...steps] };
}

describe("siteRoute's order", () => {
  it("a bad param with no session is a 400 naming the param", async () => {
    const r = await send({ ...house, houseId: "not-an-id" }, goodBody);
    expect(r).toMatchObject({ status: 400, code: "bad_input", steps: [] });
    expect(Object.keys(r.fields!)).toEqual(["houseId"]);
  });

  it("a bad body with no session is a 400 naming the field", async () => {
    const r = await send(house, { note: "far too long for it" });
    expect(r).toMatchObject({ status: 400, code: "bad_input", steps: [] });
    expect(Object.keys(r.fields!)).toEqual(["note"]);
  });

  it("good input with no session is a 401", async () => {
    expect(await send(house, goodBody)).toMatchObject({ status: 401, code: "unauthenticated", steps: [] });
  });

  it("a member of another site gets a 404, and nothing is loaded", async () => {
    expect(await send(house, goodBody, outsider.cookie)).toMatchObject({ status: 404, code: "not_found", steps: [] });
  });

  it("a viewer asking for a house that is not there gets a 404 before any permission is checked", async () => {
    const r = await send({ ...house, houseId: randomUUID() }, goodBody, cookies.viewer);
    expect(r).toMatchObject({ status: 404, code: "not_found", steps: ["load"] });
  });

  it("a viewer without the permission gets a 403, after the load and before the handler", async () => {
    expect(await send(house, goodBody, cookies.viewer)).toMatchObject({ status: 403, code: "forbidden", steps: ["load"] });
  });

  it("a grower gets through: load, handler, then the wake-up", async () => {
    const r = await send(house, goodBody, cookies.grower);
    expect(r).toMatchObject({ status: 200, steps: ["load", "handle", "wake"] });
  });
});
