// The audit trail's API: filters by who, what and local dates, and newest-first pages.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog } from "@/db/schema";
import * as sitesRoute from "@/app/api/sites/route";
import * as auditRoute from "@/app/api/sites/[siteId]/audit/route";
import { call, signUp, type Account } from "../support/http";

type Entry = { id: number; at: string; userId: string | null; userName: string | null; action: string; entityType: string };
type Page = { entries: Entry[]; nextCursor: string | null };

let owner: Account;
let siteId: string;
let other: string;

async function page(query: Record<string, string>, cookie = owner.cookie) {
  const qs = new URLSearchParams(query).toString();
  return call(auditRoute.GET, { path: `/api/sites/${siteId}/audit?${qs}`, params: { siteId }, cookie });
}

beforeAll(async () => {
  // Auckland: 13 hours ahead of UTC in its summer, so local days and UTC days differ.
  owner = await signUp({ siteName: "Audit Orchard", timeZone: "Pacific/Auckland" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  siteId = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
  other = (await signUp()).userId;
  const row = (at: string, userId: string | null, action: string, entityType: string) => ({
    siteId, userId, at: new Date(at), action, entityType, entityId: randomUUID(), before: null, after: { name: action },
  });
  await getDb().insert(auditLog).values([
    // 2026-01-10 10:59 UTC is 23:59 on the 10th in Auckland (NZDT, UTC+13 in January: IANA tz database); 11:00 UTC is the 11th.
    row("2026-01-10T10:59:00.000Z", owner.userId, "house.create", "house"),
    row("2026-01-10T11:00:00.000Z", owner.userId, "house.update", "house"),
    row("2026-01-11T09:00:00.000Z", other, "plug.create", "plug"),
    row("2026-01-12T09:00:00.000Z", other, "schedule.update", "schedule"),
    row("2026-01-12T09:00:00.000Z", owner.userId, "override.create", "override"),
  ]);
});

describe("GET /api/sites/[siteId]/audit", () => {
  it("pages newest first with a cursor, ties broken by id, each entry once", async () => {
    const seen: Entry[] = [];
    let cursor: string | null = null;
    for (let i = 0; i < 10; i++) {
      const response = await page({ limit: "2", ...(cursor ? { cursor } : {}) });
      expect(response.status).toBe(200);
      const body = (await response.json()) as Page;
      expect(body.entries.length).toBeLessThanOrEqual(2);
      seen.push(...body.entries);
      cursor = body.nextCursor;
      if (!cursor) break;
    }
    const ids = seen.map((e) => e.id);
    expect(new Set(ids).size).toBe(ids.length);
    // The sign-up's site.create plus the five above.
    expect(seen.map((e) => e.action).slice(-5)).toEqual(["override.create", "schedule.update", "plug.create", "house.update", "house.create"]);
    const sorted = [...seen].sort((a, b) => b.at.localeCompare(a.at) || b.id - a.id);
    expect(seen).toEqual(sorted);
  });

  it("filters by who, by kind of thing and by action", async () => {
    const byOther = (await (await page({ userId: other })).json()) as Page;
    expect(byOther.entries.map((e) => e.action)).toEqual(["schedule.update", "plug.create"]);
    const houses = (await (await page({ entityType: "house" })).json()) as Page;
    expect(houses.entries.map((e) => e.action)).toEqual(["house.update", "house.create"]);
    const overrides = (await (await page({ action: "override.create" })).json()) as Page;
    expect(overrides.entries).toHaveLength(1);
    expect(overrides.entries[0]!.userName).toBe(owner.name);
  });

  it("reads dates as local days in the site's zone", async () => {
    const tenth = (await (await page({ from: "2026-01-10", to: "2026-01-10" })).json()) as Page;
    expect(tenth.entries.map((e) => e.action)).toEqual(["house.create"]);
    const eleventh = (await (await page({ from: "2026-01-11", to: "2026-01-11" })).json()) as Page;
    expect(eleventh.entries.map((e) => e.action)).toEqual(["plug.create", "house.update"]);
    const fromTwelfth = (await (await page({ from: "2026-01-12", to: "2026-01-12", userId: owner.userId })).json()) as Page;
    expect(fromTwelfth.entries.map((e) => e.action)).toEqual(["override.create"]);
  });

  it("refuses bad filters with the field at fault", async () => {
    for (const [query, message] of [
      [{ from: "2026-01-12", to: "2026-01-10" }, "To must be on or after From"],
      [{ from: "2026-02-30" }, "From is not a date in the calendar"],
      [{ from: "yesterday" }, "From must be a date, YYYY-MM-DD"],
      [{ cursor: "abc" }, "Cursor is not one this list gave out"],
      [{ limit: "500" }, "Limit must be at most 100"],
      [{ userId: "nobody" }, "must be a person id"],
      [{ action: "DROP TABLE" }, "Action must look like house.update"],
    ] as const) {
      const response = await page(query);
      expect(response.status, JSON.stringify(query)).toBe(400);
      expect(((await response.json()) as { error: { message: string } }).error.message).toContain(message);
    }
  });
});
