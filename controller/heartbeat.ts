// The controller's sign of life: its row in controller_heartbeats, written every few
// seconds. The web app says "controller not running" when the beat goes missing.
import { hostname } from "node:os";
import { eq } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { controllerHeartbeats } from "@/db/schema";
import { logDetail } from "@/lib/database-errors";

export function createHeartbeat(options: { db: Database; instanceId: string; sites: string[] | undefined; everyMs: number; now: () => number; logger: Logger }) {
  const { db, instanceId, logger } = options;
  const startedAt = new Date(options.now());
  let failing = false;

  async function beat() {
    const beatAt = new Date(options.now());
    try {
      await db
        .insert(controllerHeartbeats)
        .values({ instanceId, host: hostname().slice(0, 120), pid: process.pid, sites: options.sites?.join(",").slice(0, 1000) ?? null, startedAt, beatAt })
        .onDuplicateKeyUpdate({ set: { beatAt, stoppedAt: null } });
      if (failing) logger.info("heartbeat written again");
      failing = false;
    } catch (error) {
      if (!failing) logger.error({ ...logDetail(error) }, "could not write the heartbeat; will keep trying");
      failing = true;
    }
  }

  return {
    beat,
    everyMs: options.everyMs,
    /** A clean stop: says so, so the pages can tell it from a crash. */
    async stopped() {
      try {
        await db.update(controllerHeartbeats).set({ stoppedAt: new Date(options.now()) }).where(eq(controllerHeartbeats.instanceId, instanceId));
      } catch (error) {
        logger.warn({ err: error }, "could not record the stop in the heartbeat");
      }
    },
  };
}
