// The switch export's one streamed query: the whole file byte for byte what the pages'
// rows written by csv-stringify give, and its pool connection given back however the
// stream ends (read to the end, cancelled by the reader part-way, the query's
// connection lost part-way).
import { randomUUID } from "node:crypto";
import { stringify } from "csv-stringify/sync";
import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb, getPool } from "@/db/client";
import { houses, plugs, switchEvents, user } from "@/db/schema";
import * as sitesRoute from "@/app/api/sites/route";
import * as exportRoute from "@/app/api/sites/[siteId]/switches/export/route";
import { getSwitchHistoryPage, openSwitchHistoryStream, type SwitchHistoryRow } from "@/db/queries/switch-history";
import { switchCsvHeader, switchCsvRecords } from "@/lib/switch-history-csv";
import { call, signUp, type Account } from "../support/http";

const ZONE = "Europe/London";
/** More rows than the driver buffers and a chunk holds, so a reader that stops leaves the query part-read. */
const ROWS = 6000;

let owner: Account;
let siteId: string;
const emptyHouseId = randomUUID();

beforeAll(async () => {
  owner = await signUp({ siteName: "Export Nursery", timeZone: ZONE });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  siteId = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
  const db = getDb();
  await db.update(user).set({ name: 'Pat "the hands", O\'Neill' }).where(sql`${user.id} = ${owner.userId}`);
  const houseId = randomUUID();
  await db.insert(houses).values({ id: houseId, siteId, name: "House, east", kind: "glasshouse", lengthM: 4, widthM: 3, eaveHeightM: 2, ridgeHeightM: 2.6, glazing: "single_glass" });
  await db.insert(houses).values({ id: emptyHouseId, siteId, name: "New house", kind: "glasshouse", lengthM: 4, widthM: 3, eaveHeightM: 2, ridgeHeightM: 2.6, glazing: "single_glass" });
  const plugIds = [randomUUID(), randomUUID()];
  await db.insert(plugs).values(
    plugIds.map((id, i) => ({ id, siteId, houseId, deviceId: `exp-${id.slice(0, 8)}`, name: i ? '=Heater "B"' : "Heater\nA", applianceKind: "heater" as const, applianceWatts: 2000, ratedCurrentA: 13 })),
  );
  // Every 7 minutes from 24 October 2026, across the clocks going back in London on the 25th
  // (01:00 UTC, IANA tz database), two plugs often on the same millisecond.
  const start = Date.UTC(2026, 9, 24);
  const rows: (typeof switchEvents.$inferInsert)[] = [];
  for (let i = 0; i < ROWS; i++) {
    const at = new Date(start + Math.floor(i / 2) * 7 * 60_000 + (i % 5 === 0 ? 0 : i % 2) * 123);
    rows.push({
      plugId: plugIds[i % 2]!,
      at,
      fromOn: i % 3 === 0 ? null : i % 2 === 0,
      toOn: i % 2 === 1,
      cause: i % 11 === 0 ? "override" : i % 13 === 0 ? "resync" : "schedule",
      userId: i % 11 === 0 ? owner.userId : null,
      ratedWatts: 2000,
      readingTempC: i % 7 === 0 ? null : (i % 400) / 10 - 5,
      readingAt: i % 7 === 0 ? null : new Date(at.getTime() - 20_000),
      commandId: `exp-${i}`,
      ackAt: i % 17 === 0 ? null : new Date(at.getTime() + 250),
      latencyMs: i % 17 === 0 ? null : 250,
      withdrawnAt: i % 19 === 0 ? new Date(at.getTime() + 100) : null,
    });
  }
  for (let i = 0; i < rows.length; i += 1000) await db.insert(switchEvents).values(rows.slice(i, i + 1000));
});

async function exportResponse(query: Record<string, string> = {}) {
  const qs = new URLSearchParams(query).toString();
  return call(exportRoute.GET, { path: `/api/sites/${siteId}/switches/export?${qs}`, params: { siteId }, cookie: owner.cookie });
}

type CoreConnection = { stream: { destroy: () => void } };
/** mysql2's own lists of the pool's connections, all and idle. */
const corePool = () => (getPool() as unknown as { pool: { _allConnections: { toArray: () => CoreConnection[] }; _freeConnections: { toArray: () => CoreConnection[] } } }).pool;

function poolCounts() {
  const core = corePool();
  return { all: core._allConnections.toArray().length, free: core._freeConnections.toArray().length };
}

function busyConnections() {
  const core = corePool();
  const free = new Set(core._freeConnections.toArray());
  return core._allConnections.toArray().filter((c) => !free.has(c));
}

/** Waits until the pool holds no connection in use (or fails after a while). */
async function expectPoolIdle() {
  for (let i = 0; i < 100; i++) {
    const { all, free } = poolCounts();
    if (all === free) return;
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
  expect(poolCounts()).toEqual({ all: poolCounts().free, free: poolCounts().free });
}

describe("the switch export's stream", () => {
  it("writes byte for byte what csv-stringify writes of the pages' rows, and gives its connection back", async () => {
    const response = await exportResponse();
    expect(response.status).toBe(200);
    // As bytes: text() would drop the byte-order mark.
    const written = Buffer.from(await response.arrayBuffer()).toString("utf8");
    const rows: SwitchHistoryRow[] = [];
    let cursor: string | undefined;
    do {
      const page = await getSwitchHistoryPage({ siteId, timeZone: ZONE, filter: {}, cursor, limit: 1000 });
      rows.push(...page.rows);
      cursor = page.nextCursor ?? undefined;
    } while (cursor);
    expect(rows).toHaveLength(ROWS);
    expect(written).toBe("\uFEFF" + stringify([switchCsvHeader(ZONE), ...rows.map(switchCsvRecords(ZONE))]));
    await expectPoolIdle();
  });

  it("leaves the pool's connections answering after an export whose reader held back at its end", async () => {
    const stream = await openSwitchHistoryStream({ siteId, timeZone: ZONE, filter: {} });
    const ended = new Promise<void>((resolve, reject) => stream.listen({ row: () => {}, end: resolve, error: reject }));
    stream.resume();
    await ended;
    // A reader's backpressure can come after the last row: it must not reach the pooled connection.
    stream.pause();
    stream.close();
    const answers = await Promise.all(
      Array.from({ length: 3 }, () =>
        Promise.race([getPool().query("SELECT 1 AS one"), new Promise((_, reject) => setTimeout(() => reject(new Error("a pooled connection did not answer in 3 s")), 3000))]),
      ),
    );
    expect(answers).toHaveLength(3);
  });

  it("gives the connection back when the reader cancels part-way, however often", async () => {
    const before = poolCounts().all;
    for (let i = 0; i < 12; i++) {
      const reader = (await exportResponse()).body!.getReader();
      expect((await reader.read()).done).toBe(false);
      expect((await reader.read()).done).toBe(false);
      await reader.cancel();
      // At once: a connection left to a later failure (rows written to a cancelled stream) does not count.
      const { all, free } = poolCounts();
      expect(free).toBe(all);
    }
    // More cancels than the pool has connections: none was kept, and a whole export still runs.
    expect(poolCounts().all).toBeLessThanOrEqual(Math.max(before, 1) + 1);
    const lines = (await (await exportResponse()).text()).split("\n").length;
    expect(lines).toBeGreaterThan(ROWS);
  });

  it("fails the download and gives the connection back when the query's connection is lost part-way", async () => {
    const reader = (await exportResponse()).body!.getReader();
    expect((await reader.read()).done).toBe(false);
    // The export's connection is the one busy; its socket goes, with rows not yet read.
    const busy = busyConnections();
    expect(busy).toHaveLength(1);
    busy[0]!.stream.destroy();
    await expect(
      (async () => {
        for (;;) if ((await reader.read()).done) return "ended";
      })(),
    ).rejects.toThrow();
    await expectPoolIdle();
  });

  it("writes the header alone for a house with no plugs yet, holding no connection", async () => {
    const response = await exportResponse({ houseId: emptyHouseId });
    expect(response.status).toBe(200);
    expect(Buffer.from(await response.arrayBuffer()).toString("utf8")).toBe("\uFEFF" + stringify([switchCsvHeader(ZONE)]));
    await expectPoolIdle();
  });

  it("refuses a filter that covers nothing of this site with 400 before streaming, holding no connection", async () => {
    const response = await exportResponse({ plugId: randomUUID() });
    expect(response.status).toBe(400);
    expect(await response.json()).toMatchObject({ error: { fields: { plugId: "Not a plug of this site" } } });
    await expectPoolIdle();
  });
});
