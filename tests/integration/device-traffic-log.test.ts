// What the broker's limits did is written to device_traffic as increments, and kept
// in memory while MariaDB cannot be reached.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import pino from "pino";
import { connect, getDb } from "@/db/client";
import { deviceTraffic } from "@/db/schema";
import { createTrafficLog } from "@/controller/traffic-log";
import { createControlSite, type ControlSite } from "../support/control-site";
import { startTcpProxy, type TcpProxy } from "../support/tcp-proxy";

let site: ControlSite;
let proxy: TcpProxy;
let through: ReturnType<typeof connect>;

beforeAll(async () => {
  site = await createControlSite(getDb());
  const url = new URL(process.env.DATABASE_URL!);
  proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
  url.host = `127.0.0.1:${proxy.port}`;
  through = connect(url.toString());
});

afterAll(async () => {
  await through?.pool.end();
  await proxy?.close();
});

function rowOf(device: string) {
  return getDb()
    .select()
    .from(deviceTraffic)
    .where(and(eq(deviceTraffic.siteId, site.siteId), eq(deviceTraffic.deviceId, device)))
    .then((rows) => rows[0]);
}

describe("the device traffic log", () => {
  it("adds to the counts, keeps the latest action, and holds events while MariaDB is away", async () => {
    const log = createTrafficLog({ db: through.db, logger: pino({ level: "silent" }), everyMs: 60_000 });
    const at = (s: number) => new Date(Date.UTC(2026, 2, 2, 14, 0, s));
    const event = (action: "slowed" | "oversized" | "disconnected", s: number) => ({ site: site.slug, kind: "sensor" as const, device: "air-1", action, at: at(s) });

    log.record(event("slowed", 1));
    log.record(event("disconnected", 2));
    await log.flush();
    expect(await rowOf("air-1")).toMatchObject({ slowed: 1, oversized: 0, disconnected: 1, lastAction: "disconnected", lastAt: at(2) });

    proxy.cut();
    log.record(event("slowed", 10));
    log.record(event("oversized", 11));
    await log.flush();
    expect(log.waiting()).toBe(1);
    // An event older than the stored last one adds to its count without moving "last".
    log.record(event("slowed", 0));
    proxy.restore();
    await log.flush();
    expect(log.waiting()).toBe(0);
    expect(await rowOf("air-1")).toMatchObject({ slowed: 3, oversized: 1, disconnected: 1, lastAction: "oversized", lastAt: at(11) });

    log.record(event("slowed", 5));
    await log.flush();
    expect(await rowOf("air-1")).toMatchObject({ slowed: 4, lastAction: "oversized", lastAt: at(11) });
    await log.close();
  });

  it("drops the counts of a site that no longer exists, and writes nothing for it", async () => {
    const log = createTrafficLog({ db: through.db, logger: pino({ level: "silent" }), everyMs: 60_000 });
    log.record({ site: "no-such-site", kind: "plug", device: "heater-1", action: "slowed", at: new Date() });
    await log.flush();
    expect(log.waiting()).toBe(0);
    expect(await rowOf("heater-1")).toBeUndefined();
    await log.close();
  });
});
