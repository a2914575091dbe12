// What the broker's per-device limits did, kept in device_traffic. Events gather in
// memory and are written every few seconds as increments, off the control path; when
// MariaDB does not answer they stay here and go with a later write.
import { inArray, sql } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { deviceTraffic, sites } from "@/db/schema";
import type { LimitAction, LimitEvent } from "./traffic-judge";
import { logDetail } from "@/lib/database-errors";

type Tally = { site: string; kind: LimitEvent["kind"]; device: string; counts: Record<LimitAction, number>; lastAction: LimitAction; lastAt: Date };

export function createTrafficLog(options: { db: Database; logger: Logger; everyMs: number }) {
  const { db, logger } = options;
  let waiting = new Map<string, Tally>();
  let writing: Promise<void> | null = null;
  let failing = false;

  function add(tally: Tally) {
    const key = `${tally.site}/${tally.kind}/${tally.device}`;
    const before = waiting.get(key);
    if (!before) return void waiting.set(key, tally);
    for (const action of Object.keys(tally.counts) as LimitAction[]) before.counts[action] += tally.counts[action];
    if (tally.lastAt >= before.lastAt) Object.assign(before, { lastAction: tally.lastAction, lastAt: tally.lastAt });
  }

  async function write(batch: Tally[]) {
    const slugs = [...new Set(batch.map((t) => t.site))];
    const ids = new Map((await db.select({ id: sites.id, slug: sites.slug }).from(sites).where(inArray(sites.slug, slugs))).map((s) => [s.slug, s.id]));
    const updatedAt = new Date();
    const rows = batch.flatMap((t) => {
      const siteId = ids.get(t.site);
      // A site deleted since: nothing to keep.
      if (!siteId) return [];
      return [{ siteId, deviceKind: t.kind, deviceId: t.device, ...t.counts, lastAction: t.lastAction, lastAt: t.lastAt, updatedAt }];
    });
    if (!rows.length) return;
    await db
      .insert(deviceTraffic)
      .values(rows)
      .onDuplicateKeyUpdate({
        // In this order: the last action is judged against the last time before that is moved on.
        set: {
          slowed: sql`${deviceTraffic.slowed} + VALUES(${deviceTraffic.slowed})`,
          oversized: sql`${deviceTraffic.oversized} + VALUES(${deviceTraffic.oversized})`,
          disconnected: sql`${deviceTraffic.disconnected} + VALUES(${deviceTraffic.disconnected})`,
          lastAction: sql`IF(${deviceTraffic.lastAt} IS NULL OR VALUES(${deviceTraffic.lastAt}) >= ${deviceTraffic.lastAt}, VALUES(${deviceTraffic.lastAction}), ${deviceTraffic.lastAction})`,
          lastAt: sql`GREATEST(COALESCE(${deviceTraffic.lastAt}, VALUES(${deviceTraffic.lastAt})), VALUES(${deviceTraffic.lastAt}))`,
          updatedAt: sql`VALUES(${deviceTraffic.updatedAt})`,
        },
      });
  }

  /** Writes what has gathered; one write at a time, and a failed one is kept for the next. */
  function flush(): Promise<void> {
    if (writing) return writing;
    if (!waiting.size) return Promise.resolve();
    const batch = [...waiting.values()];
    waiting = new Map();
    writing = write(batch)
      .then(() => {
        if (failing) logger.info("device traffic written again");
        failing = false;
      })
      .catch((error: unknown) => {
        if (!failing) logger.error({ ...logDetail(error), devices: batch.length }, "could not write device traffic; keeping it to try again");
        failing = true;
        for (const tally of batch) add(tally);
      })
      .finally(() => {
        writing = null;
      });
    return writing;
  }

  const timer = setInterval(() => void flush(), options.everyMs);
  timer.unref();

  return {
    /** Takes in one action of the broker's limits; never waits. */
    record(event: LimitEvent) {
      const counts = { slowed: 0, oversized: 0, disconnected: 0 };
      counts[event.action] = 1;
      add({ site: event.site, kind: event.kind, device: event.device, counts, lastAction: event.action, lastAt: event.at });
    },
    /** Devices whose counts wait to be written. */
    waiting: () => waiting.size,
    /** Writes what has gathered now (after any write under way). */
    async flush() {
      await writing;
      await flush();
    },
    async close() {
      clearInterval(timer);
      await writing;
      await flush();
    },
  };
}
