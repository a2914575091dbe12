// The reading side of the controller's heartbeat: the query, /api/health and the live
// data of the houses page. Heartbeat rows are written here directly, as a controller would.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { GET as health } from "@/app/api/health/route";
import { getDb } from "@/db/client";
import { getControllerStatus } from "@/db/queries/controller-status";
import { getSiteLive } from "@/db/queries/live";
import { controllerHeartbeats, sites } from "@/db/schema";

const db = getDb();
const siteId = randomUUID();
const slug = `beat-${siteId.slice(0, 8)}`;
await db.insert(sites).values({ id: siteId, slug, name: `Heartbeat test ${slug}`, timeZone: "Europe/London", currency: "GBP" });

afterAll(async () => {
  await db.delete(controllerHeartbeats);
  await db.delete(sites).where(eq(sites.id, siteId));
});

beforeEach(async () => {
  await db.delete(controllerHeartbeats);
});

const now = new Date("2031-05-04T03:02:01.123Z");
const ago = (ms: number, from = now) => new Date(from.getTime() - ms);

async function beat(row: { beatAt: Date; sites?: string | null; stoppedAt?: Date | null }) {
  await db.insert(controllerHeartbeats).values({
    instanceId: randomUUID(),
    host: "test-host",
    pid: 4242,
    sites: row.sites ?? null,
    startedAt: ago(600_000, row.beatAt),
    beatAt: row.beatAt,
    stoppedAt: row.stoppedAt ?? null,
  });
}

describe("getControllerStatus", () => {
  it("is not running, never heard, when no controller has written a beat", async () => {
    expect(await getControllerStatus({ now })).toEqual({ running: false, lastBeatAt: null });
    expect(await getControllerStatus({ now, siteId })).toEqual({ running: false, lastBeatAt: null });
  });

  it("is running on a recent beat, and not after 20 s of silence", async () => {
    await beat({ beatAt: ago(4_000) });
    expect(await getControllerStatus({ now })).toEqual({ running: true, lastBeatAt: ago(4_000) });
    expect(await getControllerStatus({ now: new Date(now.getTime() + 16_001) })).toEqual({ running: false, lastBeatAt: ago(4_000) });
  });

  it("is not running when the recent beat is from a controller that stopped cleanly", async () => {
    await beat({ beatAt: ago(2_000), stoppedAt: ago(1_000) });
    await beat({ beatAt: ago(60_000) });
    expect(await getControllerStatus({ now })).toEqual({ running: false, lastBeatAt: ago(2_000) });
  });

  it("for a site, counts only controllers that serve it: all sites, or it among theirs", async () => {
    await beat({ beatAt: ago(1_000), sites: "elsewhere,another" });
    expect(await getControllerStatus({ now, siteId })).toEqual({ running: false, lastBeatAt: null });
    expect((await getControllerStatus({ now })).running).toBe(true);

    await beat({ beatAt: ago(3_000), sites: `elsewhere,${slug}` });
    expect(await getControllerStatus({ now, siteId })).toEqual({ running: true, lastBeatAt: ago(3_000) });

    await db.delete(controllerHeartbeats);
    await beat({ beatAt: ago(5_000), sites: null });
    expect(await getControllerStatus({ now, siteId })).toEqual({ running: true, lastBeatAt: ago(5_000) });
  });
});

describe("the controller's state where people see it", () => {
  it("the live data of the houses page carries it", async () => {
    expect((await getSiteLive({ siteId, now })).controller).toEqual({ running: false, lastBeatAt: null });
    await beat({ beatAt: ago(2_000), sites: slug });
    expect((await getSiteLive({ siteId, now })).controller).toEqual({ running: true, lastBeatAt: ago(2_000) });
  });

  it("/api/health reports it and stays 200 without it: health is about the web app", async () => {
    const read = async () => {
      const response = await health();
      return { status: response.status, body: (await response.json()) as { status: string; controller: string } };
    };
    expect(await read()).toMatchObject({ status: 200, body: { status: "ok", controller: "not running" } });
    await beat({ beatAt: ago(1_000, new Date()) });
    expect(await read()).toMatchObject({ status: 200, body: { status: "ok", controller: "running" } });
  });
});
