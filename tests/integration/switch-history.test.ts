// The switch history's API and CSV: filters, keyset pages (ties on the time included),
// withdrawn and observed rows, local dates across a clock change, the export read
// back with csv-parse, and bad input.
import { randomUUID } from "node:crypto";
import { parse } from "csv-parse/sync";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { houses, memberships, overrides, plugs, sites, switchEvents, user } from "@/db/schema";
import * as sitesRoute from "@/app/api/sites/route";
import * as switchesRoute from "@/app/api/sites/[siteId]/switches/route";
import * as exportRoute from "@/app/api/sites/[siteId]/switches/export/route";
import { streamSwitchHistory } from "@/db/queries/switch-history";
import { call, signUp, type Account } from "../support/http";

type Row = {
  id: number;
  at: string;
  plugId: string;
  plugName: string;
  plugRetired: boolean;
  houseId: string;
  houseName: string;
  fromOn: boolean | null;
  toOn: boolean;
  cause: string;
  status: string;
  readingTempC: number | null;
  userId: string | null;
  userName: string | null;
  reason: string | null;
  latencyMs: number | null;
  commandId: string;
};
type Page = { rows: Row[]; nextCursor: string | null };

let owner: Account;
let helper: Account;
let siteId: string;
let slug: string;
const house = { a: randomUUID(), b: randomUUID() };
const plug = { heater: randomUUID(), fan: randomUUID(), retired: randomUUID(), otherSite: randomUUID() };
const overrideId = randomUUID();
let otherHouseId: string;

const houseRow = (id: string, site: string, name: string) => ({
  id,
  siteId: site,
  name,
  kind: "glasshouse" as const,
  lengthM: 4,
  widthM: 3,
  eaveHeightM: 2,
  ridgeHeightM: 2.6,
  glazing: "single_glass" as const,
});
const plugRow = (id: string, site: string, houseId: string, name: string, retiredAt: Date | null = null) => ({
  id,
  siteId: site,
  houseId,
  deviceId: `dev-${id.slice(0, 8)}`,
  name,
  applianceKind: "heater" as const,
  applianceWatts: 2000,
  ratedCurrentA: 13,
  retiredAt,
});

let seq = 0;
function event(plugId: string, at: string, extra: Partial<typeof switchEvents.$inferInsert> = {}): typeof switchEvents.$inferInsert {
  seq++;
  const when = new Date(at);
  return {
    plugId,
    at: when,
    fromOn: seq % 2 === 0,
    toOn: seq % 2 === 1,
    cause: "schedule",
    ratedWatts: 2000,
    readingTempC: 7.5,
    readingAt: new Date(when.getTime() - 20_000),
    commandId: `hist-${randomUUID()}`,
    ackAt: new Date(when.getTime() + 300),
    latencyMs: 300,
    ...extra,
  };
}

async function page(query: Record<string, string>, cookie = owner.cookie) {
  const qs = new URLSearchParams(query).toString();
  return call(switchesRoute.GET, { path: `/api/sites/${siteId}/switches?${qs}`, params: { siteId }, cookie });
}

async function allPages(query: Record<string, string>, limit: number): Promise<{ rows: Row[]; pages: number }> {
  const rows: Row[] = [];
  let cursor: string | null = null;
  let pages = 0;
  do {
    const response = await page({ ...query, limit: String(limit), ...(cursor ? { cursor } : {}) });
    expect(response.status).toBe(200);
    const body = (await response.json()) as Page;
    expect(body.rows.length).toBeLessThanOrEqual(limit);
    rows.push(...body.rows);
    cursor = body.nextCursor;
    pages++;
  } while (cursor && pages < 100);
  return { rows, pages };
}

async function exportCsv(query: Record<string, string>, cookie = owner.cookie) {
  const qs = new URLSearchParams(query).toString();
  return call(exportRoute.GET, { path: `/api/sites/${siteId}/switches/export?${qs}`, params: { siteId }, cookie });
}

/** The rows of the time-ordered fixture that ties share: three plugs switched on the same millisecond. */
const TIE = "2026-01-15T08:00:00.000Z";

beforeAll(async () => {
  owner = await signUp({ siteName: "History Nursery", timeZone: "Europe/London" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  const site = ((await response.json()) as { sites: { id: string; slug: string }[] }).sites[0]!;
  siteId = site.id;
  slug = site.slug;
  helper = await signUp();
  const db = getDb();
  await db.update(user).set({ name: "=HYPERLINK(\"http://x.example\",\"Pat\")" }).where(eq(user.id, helper.userId));
  await db.insert(memberships).values({ siteId, userId: helper.userId, role: "helper" });

  // Another site, with a plug and switches that must never show.
  const otherSite = randomUUID();
  otherHouseId = randomUUID();
  await db.insert(sites).values({ id: otherSite, slug: `other-${otherSite.slice(0, 8)}`, name: "Elsewhere", timeZone: "UTC", currency: "GBP" });
  await db.insert(houses).values([houseRow(house.a, siteId, "Propagation"), houseRow(house.b, siteId, "Tomato house"), houseRow(otherHouseId, otherSite, "Theirs")]);
  await db.insert(plugs).values([
    plugRow(plug.heater, siteId, house.a, "Bench heater"),
    plugRow(plug.fan, siteId, house.b, "Tube heater"),
    plugRow(plug.retired, siteId, house.b, "Old heater", new Date("2026-02-01T00:00:00Z")),
    plugRow(plug.otherSite, otherSite, otherHouseId, "Not ours"),
  ]);
  await db.insert(overrides).values({
    id: overrideId,
    plugId: plug.heater,
    on: false,
    startsAt: new Date("2026-01-20T10:00:00Z"),
    endsAt: new Date("2026-01-20T11:00:00Z"),
    userId: helper.userId,
    reason: "@SUM(1+1) watering",
  });

  const rows: (typeof switchEvents.$inferInsert)[] = [];
  // 30 ordinary switches, one an hour across two plugs.
  for (let i = 0; i < 30; i++) rows.push(event(i % 2 ? plug.heater : plug.fan, new Date(Date.UTC(2026, 0, 10, i)).toISOString()));
  // The retired plug's history.
  rows.push(event(plug.retired, "2026-01-12T06:00:00.000Z", { cause: "default" }));
  // Ties: three plugs on the same millisecond (a schedule edge), and one plug twice.
  rows.push(event(plug.heater, TIE), event(plug.fan, TIE), event(plug.retired, TIE), event(plug.heater, TIE));
  // An override with its person and reason; one withdrawn before the plug confirmed; two observed.
  rows.push(event(plug.heater, "2026-01-20T10:00:00.000Z", { cause: "override", userId: helper.userId, overrideId, readingTempC: null, readingAt: null }));
  rows.push(event(plug.heater, "2026-01-20T10:00:05.000Z", { cause: "schedule", ackAt: null, latencyMs: null, withdrawnAt: new Date("2026-01-20T10:00:06.000Z") }));
  rows.push(event(plug.fan, "2026-01-21T03:00:00.000Z", { cause: "plug_fallback", ackAt: null, latencyMs: null, readingTempC: null, readingAt: null }));
  rows.push(event(plug.fan, "2026-01-21T04:00:00.000Z", { cause: "resync", ackAt: null, latencyMs: null, readingTempC: null, readingAt: null }));
  // Around the clocks going back in London on Sunday 25 October 2026 (02:00 BST → 01:00 GMT, IANA tz
  // database: the last Sunday of October at 01:00 UTC): the local day runs 25 hours, 2026-10-24T23:00Z
  // to 2026-10-26T00:00Z, and 01:30 happens twice.
  rows.push(
    event(plug.heater, "2026-10-24T22:59:00.000Z"), // 23:59 BST on the 24th
    event(plug.heater, "2026-10-24T23:00:00.000Z"), // 00:00 BST on the 25th
    event(plug.heater, "2026-10-25T00:30:00.000Z"), // 01:30 BST
    event(plug.heater, "2026-10-25T01:30:00.000Z"), // 01:30 GMT
    event(plug.heater, "2026-10-25T23:59:00.000Z"), // 23:59 GMT on the 25th
    event(plug.heater, "2026-10-26T00:00:00.000Z"), // 00:00 GMT on the 26th
  );
  rows.push(event(plug.otherSite, "2026-01-15T09:00:00.000Z"));
  await db.insert(switchEvents).values(rows);
});

const sortedNewestFirst = (rows: Row[]) => [...rows].sort((a, b) => b.at.localeCompare(a.at) || b.id - a.id);

describe("GET /api/sites/[siteId]/switches", () => {
  it("pages newest first with an opaque cursor: nothing lost or repeated, ties broken by id", async () => {
    const whole = await allPages({}, 200);
    expect(whole.pages).toBe(1);
    expect(whole.rows).toHaveLength(45);
    expect(whole.rows).toEqual(sortedNewestFirst(whole.rows));
    for (const limit of [1, 2, 3, 7]) {
      const paged = await allPages({}, limit);
      expect(paged.rows.map((r) => r.id)).toEqual(whole.rows.map((r) => r.id));
    }
    const tied = whole.rows.filter((r) => r.at === TIE);
    expect(tied).toHaveLength(4);
    // A page boundary inside the tie: pages of 2 starting just before it.
    const before = whole.rows.findIndex((r) => r.at === TIE) - 1;
    const first = (await (await page({ limit: String(before + 2) })).json()) as Page;
    const rest = (await (await page({ limit: "2", cursor: first.nextCursor! })).json()) as Page;
    expect([...first.rows, ...rest.rows].slice(before, before + 4).map((r) => r.id)).toEqual(whole.rows.slice(before, before + 4).map((r) => r.id));
    expect(first.nextCursor).not.toMatch(/^\d/);
  });

  it("keeps other sites' switches out and retired plugs' history in", async () => {
    const { rows } = await allPages({}, 200);
    expect(rows.some((r) => r.plugId === plug.otherSite)).toBe(false);
    const retired = rows.filter((r) => r.plugId === plug.retired);
    expect(retired).toHaveLength(2);
    expect(retired.every((r) => r.plugRetired && r.houseName === "Tomato house")).toBe(true);
  });

  it("says what each switch was: carried out, withdrawn, observed; with the person and reason of an override", async () => {
    const { rows } = await allPages({ from: "2026-01-20", to: "2026-01-21" }, 50);
    const byCause = (cause: string) => rows.filter((r) => r.cause === cause);
    const [override] = byCause("override");
    expect(override).toMatchObject({ status: "carried_out", userId: helper.userId, reason: "@SUM(1+1) watering", latencyMs: 300 });
    expect(override!.userName).toContain("HYPERLINK");
    expect(rows.find((r) => r.at === "2026-01-20T10:00:05.000Z")).toMatchObject({ status: "withdrawn", latencyMs: null });
    expect(byCause("plug_fallback")[0]!.status).toBe("observed");
    expect(byCause("resync")[0]!.status).toBe("observed");
  });

  it("filters by house, plug, cause, person and local dates, alone and together", async () => {
    const everything = (await allPages({}, 200)).rows;
    const check = async (query: Record<string, string>, keep: (r: Row) => boolean) => {
      const expected = everything.filter(keep).map((r) => r.id);
      expect(expected.length).toBeGreaterThan(0);
      for (const limit of [3, 200]) expect((await allPages(query, limit)).rows.map((r) => r.id)).toEqual(expected);
    };
    await check({ houseId: house.b }, (r) => r.houseId === house.b);
    await check({ plugId: plug.heater }, (r) => r.plugId === plug.heater);
    await check({ cause: "default" }, (r) => r.cause === "default");
    await check({ cause: "schedule", houseId: house.a }, (r) => r.cause === "schedule" && r.houseId === house.a);
    await check({ userId: helper.userId }, (r) => r.userId === helper.userId);
    await check({ plugId: plug.heater, cause: "override" }, (r) => r.plugId === plug.heater && r.cause === "override");
    await check({ from: "2026-01-10", to: "2026-01-10", houseId: house.b }, (r) => r.at.startsWith("2026-01-10") && r.houseId === house.b);
    const nobody = (await (await page({ userId: owner.userId })).json()) as Page;
    expect(nobody).toEqual({ rows: [], nextCursor: null });
  });

  it("reads dates as local days in the site's zone, 25 hours on the day the clocks go back", async () => {
    const { rows } = await allPages({ from: "2026-10-25", to: "2026-10-25" }, 2);
    expect(rows.map((r) => r.at)).toEqual(["2026-10-25T23:59:00.000Z", "2026-10-25T01:30:00.000Z", "2026-10-25T00:30:00.000Z", "2026-10-24T23:00:00.000Z"]);
  });

  it("answers bad filters with 400 and says what is wrong", async () => {
    const bad: [Record<string, string>, string][] = [
      [{ cause: "sunshine" }, "cause"],
      [{ from: "2026-02-30" }, "from"],
      [{ from: "yesterday" }, "from"],
      [{ from: "2026-03-02", to: "2026-03-01" }, "to"],
      [{ cursor: "42" }, "cursor"],
      [{ limit: "0" }, "limit"],
      [{ limit: "5000" }, "limit"],
      [{ plugId: "heater" }, "plugId"],
      [{ houseId: otherHouseId }, "houseId"],
      [{ plugId: plug.otherSite }, "plugId"],
      [{ houseId: house.a, plugId: plug.fan }, "plugId"],
    ];
    for (const [query, field] of bad) {
      const response = await page(query);
      expect(response.status, JSON.stringify(query)).toBe(400);
      const body = (await response.json()) as { error: { code: string; message: string; fields?: Record<string, string> } };
      expect(body.error.code).toBe("bad_input");
      expect(body.error.message.length).toBeGreaterThan(5);
      expect(Object.keys(body.error.fields ?? {}), JSON.stringify(query)).toContain(field);
    }
  });

  it("lets every member read the history", async () => {
    expect((await page({}, helper.cookie)).status).toBe(200);
  });
});

describe("GET /api/sites/[siteId]/switches/export", () => {
  it("streams the filtered set as CSV: the pages' rows, the zone in the header, an ISO column, the site in the file name", async () => {
    const response = await exportCsv({});
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toMatch(new RegExp(`^attachment; filename="${slug}-switches-all-to-\\d{4}-\\d{2}-\\d{2}\\.csv"$`));
    const records = parse(await response.text(), { bom: true }) as string[][];
    const [header, ...body] = records;
    expect(header).toEqual([
      "Local time (Europe/London)",
      "UTC time (ISO 8601)",
      "House",
      "Plug",
      "From",
      "To",
      "Cause",
      "Status",
      "Reading (°C)",
      "Reading time (UTC, ISO 8601)",
      "Person",
      "Reason",
      "Latency (ms)",
      "Command id",
    ]);
    const { rows } = await allPages({}, 7);
    expect(body.map((r) => r[1])).toEqual(rows.map((r) => r.at));
    expect(body.map((r) => r[13])).toEqual(rows.map((r) => r.commandId));

    const local = (iso: string) => body.find((r) => r[1] === iso)![0];
    // 00:30 and 01:30 UTC on 25 October 2026 are both 01:30 in London: BST (+01:00), then GMT (+00:00).
    expect(local("2026-10-25T00:30:00.000Z")).toBe("2026-10-25 01:30:00 +01:00");
    expect(local("2026-10-25T01:30:00.000Z")).toBe("2026-10-25 01:30:00 +00:00");
    expect(local("2026-01-10T05:00:00.000Z")).toBe("2026-01-10 05:00:00 +00:00");

    const override = body.find((r) => r[6] === "Manual override")!;
    expect(override[10]).toBe("'=HYPERLINK(\"http://x.example\",\"Pat\")");
    expect(override[11]).toBe("'@SUM(1+1) watering");
    expect(override[7]).toBe("Carried out");
    expect(body.find((r) => r[1] === "2026-01-20T10:00:05.000Z")![7]).toBe("Withdrawn, never happened");
    expect(body.filter((r) => r[7] === "Observed, not commanded").map((r) => r[6]).sort()).toEqual(["Found changed", "Plug's own fall-back"]);
    expect(body.find((r) => r[1] === "2026-01-10T05:00:00.000Z")).toMatchObject({ 4: expect.stringMatching(/^(on|off)$/), 8: "7.50", 9: "2026-01-10T04:59:40.000Z", 12: "300" });
  });

  it("exports what the filters cover, in batches across a tie, with the dates in the file name", async () => {
    const response = await exportCsv({ from: "2026-10-25", to: "2026-10-25" });
    expect(response.headers.get("content-disposition")).toContain(`${slug}-switches-2026-10-25-to-2026-10-25.csv`);
    const body = (parse(await response.text(), { bom: true }) as string[][]).slice(1);
    expect(body.map((r) => r[0])).toEqual(["2026-10-25 23:59:00 +00:00", "2026-10-25 01:30:00 +00:00", "2026-10-25 01:30:00 +01:00", "2026-10-25 00:00:00 +01:00"]);
  });

  it("reads the export's keyset batches without losing or repeating a row at a tie", async () => {
    const { rows } = await allPages({}, 200);
    const streamed: number[] = [];
    for await (const batch of streamSwitchHistory({ siteId, timeZone: "Europe/London", filter: {}, batchSize: 2 })) {
      expect(batch.length).toBeLessThanOrEqual(2);
      streamed.push(...batch.map((r) => r.id));
    }
    expect(streamed).toEqual(rows.map((r) => r.id));
  });

  it("refuses bad filters with 400 before anything is sent, and roles without reports.export with 403", async () => {
    const bad = await exportCsv({ houseId: otherHouseId });
    expect(bad.status).toBe(400);
    expect(bad.headers.get("content-type")).toContain("application/json");
    expect((await exportCsv({ to: "2026-13-01" })).status).toBe(400);
    expect((await exportCsv({}, helper.cookie)).status).toBe(403);
  });
});
