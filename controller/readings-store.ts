// Readings and sensor presence, written in batches (a plug's presence goes with its
// present state, through the switch log). A
// sensor reports every few seconds, so rows are gathered and inserted many at a time;
// raw rows are kept for a set time and summarised per minute for the long run.
import { and, gte, lt, sql } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { readingMinutes, readings, sensorStates, sensors } from "@/db/schema";
import { isMissingParent, stillThere } from "./missing-parents";
import { logDetail } from "@/lib/database-errors";
import { insertMany, upsertMany } from "@/db/bulk";

export type ReadingRow = typeof readings.$inferInsert;

export type ReadingsStoreOptions = {
  db: Database;
  logger: Logger;
  flushMs: number;
  maxBatch: number;
  /** Rows kept in memory while MariaDB is away; the oldest go first past this. */
  maxWaiting: number;
  rawRetentionMs: number;
  now: () => number;
};

type SensorSeen = Pick<typeof sensorStates.$inferSelect, "online" | "lastSeenAt">;

export function createReadingsStore(options: ReadingsStoreOptions) {
  const { db, logger } = options;
  let queue: ReadingRow[] = [];
  const sensorsSeen = new Map<string, SensorSeen>();
  let running: Promise<void> | undefined;
  let retryAt = 0;
  let failures = 0;
  let dropped = 0;
  let closed = false;
  let rolledUpTo: number | undefined;
  // The earliest reading written since the last roll-up: readings that waited out an
  // outage land in minutes already summarised, and those minutes are summarised again.
  let earliestWritten = Infinity;

  async function write() {
    while (queue.length > 0) {
      const batch = queue.slice(0, options.maxBatch);
      await insertMany(db, readings, batch);
      for (const row of batch) earliestWritten = Math.min(earliestWritten, row.at.getTime());
      queue = queue.slice(batch.length);
    }
    // Sensor presence: one upsert for everything heard since the last write.
    const updatedAt = new Date();
    const sensorsNow = [...sensorsSeen];
    await upsertMany(db, sensorStates, sensorsNow.map(([sensorId, seen]) => ({ sensorId, ...seen, updatedAt })));
    for (const [id, seen] of sensorsNow) if (sensorsSeen.get(id) === seen) sensorsSeen.delete(id);
  }

  /** Drops what waits for sensors deleted meanwhile; true when there was any. */
  async function forgetDeletedSensors(): Promise<boolean> {
    const present = await stillThere(db, sensors, sensors.id, [...queue.map((r) => r.sensorId), ...sensorsSeen.keys()]);
    const before = queue.length + sensorsSeen.size;
    queue = queue.filter((r) => present.has(r.sensorId));
    for (const id of [...sensorsSeen.keys()]) if (!present.has(id)) sensorsSeen.delete(id);
    const forgotten = before - queue.length - sensorsSeen.size;
    if (forgotten) logger.warn({ forgotten }, "readings of sensors deleted meanwhile were dropped");
    return forgotten > 0;
  }

  function flush(force = false): Promise<void> {
    if (running) return running;
    if ((queue.length === 0 && sensorsSeen.size === 0) || (!force && Date.now() < retryAt)) return Promise.resolve();
    running = write()
      .catch(async (error: unknown) => {
        if (isMissingParent(error) && (await forgetDeletedSensors())) return write();
        throw error;
      })
      .then(() => {
        failures = 0;
        retryAt = 0;
      })
      .catch((error: unknown) => {
        failures++;
        retryAt = Date.now() + Math.min(30_000, 250 * 2 ** Math.min(failures, 7));
        logger.error({ ...logDetail(error), waiting: queue.length, failures }, "readings write failed; keeping them to retry");
      })
      .finally(() => {
        running = undefined;
      });
    return running;
  }

  /** Per-minute summaries of every complete minute not yet summarised; then old raw rows go. */
  async function rollUp() {
    const late = earliestWritten;
    try {
      await summarise();
    } catch (error) {
      earliestWritten = Math.min(earliestWritten, late);
      throw error;
    }
  }

  async function summarise() {
    const now = options.now();
    const currentMinute = Math.floor(now / 60_000) * 60_000;
    // Raw rows before this instant are being deleted: a minute before it cannot be summarised whole.
    const oldestWhole = Math.ceil((now - options.rawRetentionMs) / 60_000) * 60_000;
    if (rolledUpTo === undefined) {
      const [row] = await db.select({ last: sql<Date | null>`MAX(${readingMinutes.minute})` }).from(readingMinutes);
      const last = row?.last ? new Date(row.last).getTime() + 60_000 : oldestWhole;
      rolledUpTo = Math.max(last, oldestWhole);
    }
    const late = Math.floor(earliestWritten / 60_000) * 60_000;
    const fromMs = Math.max(Math.min(rolledUpTo, late), oldestWhole);
    if (fromMs >= currentMinute) return;
    earliestWritten = Infinity;
    const from = new Date(fromMs);
    const to = new Date(currentMinute);
    const minute = sql`DATE_FORMAT(${readings.at}, '%Y-%m-%d %H:%i:00')`;
    await db.execute(sql`
      INSERT INTO ${readingMinutes} (sensor_id, minute, samples, temp_min_c, temp_max_c, temp_mean_c, rh_mean)
      SELECT ${readings.sensorId}, ${minute}, COUNT(*), MIN(${readings.tempC}), MAX(${readings.tempC}), AVG(${readings.tempC}), AVG(${readings.rh})
      FROM ${readings}
      WHERE ${and(gte(readings.at, from), lt(readings.at, to))}
      GROUP BY ${readings.sensorId}, ${minute}
      ON DUPLICATE KEY UPDATE samples = VALUES(samples), temp_min_c = VALUES(temp_min_c), temp_max_c = VALUES(temp_max_c),
        temp_mean_c = VALUES(temp_mean_c), rh_mean = VALUES(rh_mean)
    `);
    rolledUpTo = currentMinute;
    const cutoff = new Date(now - options.rawRetentionMs);
    await db.execute(sql`DELETE FROM ${readings} WHERE ${lt(readings.at, cutoff)} LIMIT 20000`);
  }

  const timer = setInterval(() => void flush(), options.flushMs);
  timer.unref();
  const rollTimer = setInterval(() => {
    rollUp().catch((error: unknown) => logger.error({ ...logDetail(error) }, "reading roll-up failed; will try again"));
  }, 60_000);
  rollTimer.unref();

  return {
    add(row: ReadingRow) {
      queue.push(row);
      if (queue.length > options.maxWaiting) {
        const excess = queue.length - options.maxWaiting;
        queue.splice(0, excess);
        dropped += excess;
        if (dropped % 1000 < excess) logger.warn({ dropped }, "dropping the oldest waiting readings");
      }
      if (queue.length >= options.maxBatch) void flush();
    },
    sensorSeen(sensorId: string, online: boolean, at: Date) {
      sensorsSeen.set(sensorId, { online, lastSeenAt: at });
    },
    flush: async () => {
      await running;
      await flush(true);
    },
    rollUp,
    waiting: () => queue.length,
    dropped: () => dropped,
    async close() {
      if (closed) return;
      closed = true;
      clearInterval(timer);
      clearInterval(rollTimer);
      await running;
      await flush(true);
    },
  };
}

export type ReadingsStore = ReturnType<typeof createReadingsStore>;
