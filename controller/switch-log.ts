// The switch log and each plug's present state (plug_states: the lifecycle's state,
// presence, the last report), written in batches. A switch is
// recorded when its command goes out and completed when the plug acknowledges it, or
// withdrawn when a newer decision replaces it first; all are upserts keyed by the
// command id, so a row is never written twice. The present state (plug_states) goes
// in the same transaction as the log rows it points at, so the two never disagree:
// the pages and a restarted controller read it. While MariaDB is unreachable the rows
// wait here and go out in order when it is back.
import type { Logger } from "pino";
import type { Database } from "@/db/client";
import { meterSamples, overrides, plugStates, plugs, switchEvents, user } from "@/db/schema";
import { isMissingParent, stillThere } from "./missing-parents";
import { logDetail } from "@/lib/database-errors";
import { insertMany, updateMany, upsertMany } from "@/db/bulk";
import type { EnergyChange } from "@/db/energy-days";

export type SwitchRow = typeof switchEvents.$inferInsert & { commandId: string };

/** Columns of a plug's row in plug_states: what the lifecycle keeps, presence, its last report. */
export type PresentState = Partial<Omit<typeof plugStates.$inferSelect, "plugId" | "updatedAt">>;

export type SwitchLogOptions = {
  db: Database;
  logger: Logger;
  flushMs: number;
  maxBatch: number;
  /** Told, after each write, where the written rows change the plugs' runtime and energy. */
  onWritten?: (changes: EnergyChange[]) => void;
};

export type SwitchLog = {
  record: (row: SwitchRow) => void;
  acknowledge: (commandId: string, ackAt: Date, latencyMs: number) => void;
  /** A newer decision replaced this switch before the plug confirmed it. */
  withdraw: (commandId: string, at: Date) => void;
  /** Columns of the plug's present state as they are now; written with the log rows recorded before them. */
  present: (plugId: string, state: PresentState) => void;
  /** A reading of the plug's energy counter, kept for metered kWh. */
  meter: (plugId: string, at: Date, wattHours: number) => void;
  /** Writes what is waiting now (ignoring any back-off). */
  flush: () => Promise<void>;
  waiting: () => number;
  close: () => Promise<void>;
};

export function createSwitchLog(options: SwitchLogOptions): SwitchLog {
  const { db, logger } = options;
  // Insertion order is write order. A row changed while its batch was being written
  // gets a new version and stays queued, so the change is written too.
  const queue = new Map<string, { row: SwitchRow; version: number }>();
  // Rows that are in MariaDB already whose acknowledgement or withdrawal came later.
  type Later = { ackAt?: Date; latencyMs?: number; withdrawnAt?: Date };
  const acks = new Map<string, Later>();
  // Where each written row is, so a later withdrawal can say which runtime it changes.
  const written = new Map<string, { plugId: string; atMs: number }>();
  const present = new Map<string, PresentState>();
  let samples: (typeof meterSamples.$inferInsert)[] = [];
  let version = 0;
  let running: Promise<void> | undefined;
  let failures = 0;
  let retryAt = 0;
  let closed = false;

  function put(row: SwitchRow) {
    queue.delete(row.commandId);
    queue.set(row.commandId, { row, version: ++version });
  }

  async function write() {
    const batch = [...queue.values()];
    const acked = [...acks];
    const states = [...present];
    const meter = samples;
    samples = [];
    try {
      await db.transaction(async (tx) => {
        for (let i = 0; i < batch.length; i += options.maxBatch) {
          const rows = batch.slice(i, i + options.maxBatch).map((b) => b.row);
          await insertMany(tx, switchEvents, rows, { fillIn: ["ackAt", "latencyMs", "withdrawnAt"] });
        }
        // Acknowledgements and withdrawals of rows already written: one UPDATE for all.
        await updateMany(tx, switchEvents, "commandId", acked.map(([commandId, ack]) => ({ commandId, ...ack })));
        const updatedAt = new Date();
        await upsertMany(tx, plugStates, states.map(([plugId, state]) => ({ plugId, ...state, updatedAt })));
        for (let i = 0; i < meter.length; i += options.maxBatch) await insertMany(tx, meterSamples, meter.slice(i, i + options.maxBatch), { keep: true });
      });
    } catch (error) {
      samples = [...meter, ...samples];
      throw error;
    }
    const changes: EnergyChange[] = [];
    for (const { row } of batch) changes.push({ plugId: row.plugId, fromMs: row.at.getTime(), toMs: row.at.getTime() });
    for (const [commandId, later] of acked) {
      const where = written.get(commandId);
      if (where && later.withdrawnAt) changes.push({ plugId: where.plugId, fromMs: where.atMs, toMs: where.atMs });
    }
    for (const m of meter) changes.push({ plugId: m.plugId, fromMs: m.at.getTime(), toMs: m.at.getTime() });
    if (changes.length) options.onWritten?.(changes);
    for (const { row, version: v } of batch) {
      written.set(row.commandId, { plugId: row.plugId, atMs: row.at.getTime() });
      if (queue.get(row.commandId)?.version === v) queue.delete(row.commandId);
    }
    for (const [commandId, ack] of acked) if (acks.get(commandId) === ack) acks.delete(commandId);
    for (const [plugId, state] of states) if (present.get(plugId) === state) present.delete(plugId);
    // Only recent command ids can still be acknowledged; keep the set small.
    if (written.size > 50_000) written.clear();
  }

  /**
   * Rows of plugs deleted meanwhile are dropped; an override or person deleted meanwhile
   * is unlinked from its switch (as the foreign key's ON DELETE SET NULL would have).
   * True when anything changed.
   */
  async function repairMissingParents(): Promise<boolean> {
    const rows = [...queue.values()].map((q) => q.row);
    const [plugsThere, overridesThere, usersThere] = await Promise.all([
      stillThere(db, plugs, plugs.id, [...rows.map((r) => r.plugId), ...present.keys(), ...samples.map((m) => m.plugId)]),
      stillThere(db, overrides, overrides.id, rows.map((r) => r.overrideId)),
      stillThere(db, user, user.id, rows.map((r) => r.userId)),
    ]);
    let changed = 0;
    for (const [commandId, queued] of [...queue]) {
      const { row } = queued;
      if (!plugsThere.has(row.plugId)) {
        queue.delete(commandId);
        changed++;
        continue;
      }
      const unlink = { ...(row.overrideId && !overridesThere.has(row.overrideId) ? { overrideId: null } : {}), ...(row.userId && !usersThere.has(row.userId) ? { userId: null } : {}) };
      if (Object.keys(unlink).length) {
        queue.set(commandId, { row: { ...row, ...unlink }, version: queued.version });
        changed++;
      }
    }
    for (const plugId of [...present.keys()]) {
      if (plugsThere.has(plugId)) continue;
      present.delete(plugId);
      changed++;
    }
    const keptSamples = samples.filter((m) => plugsThere.has(m.plugId));
    changed += samples.length - keptSamples.length;
    samples = keptSamples;
    if (changed) logger.warn({ changed }, "switch-log rows of plugs, overrides or people deleted meanwhile were dropped or unlinked");
    return changed > 0;
  }

  function flush(force = false): Promise<void> {
    if (running) return running;
    if ((queue.size === 0 && acks.size === 0 && present.size === 0 && samples.length === 0) || (!force && Date.now() < retryAt)) return Promise.resolve();
    running = write()
      .catch(async (error: unknown) => {
        if (isMissingParent(error) && (await repairMissingParents())) return write();
        throw error;
      })
      .then(() => {
        if (failures > 0) logger.info({ failures }, "switch log is writing again");
        failures = 0;
        retryAt = 0;
      })
      .catch((error: unknown) => {
        failures++;
        retryAt = Date.now() + Math.min(30_000, 250 * 2 ** Math.min(failures, 7));
        logger.error({ ...logDetail(error), waiting: queue.size + acks.size, failures }, "switch log write failed; keeping the rows to retry");
      })
      .finally(() => {
        running = undefined;
      });
    return running;
  }

  function later(commandId: string, change: Later) {
    const queued = queue.get(commandId);
    if (queued) put({ ...queued.row, ...change });
    else if (written.has(commandId)) acks.set(commandId, { ...acks.get(commandId), ...change });
  }

  const timer = setInterval(() => void flush(), options.flushMs);
  timer.unref();

  return {
    record(row) {
      put(row);
      // Not in the caller's turn: a tick that records a thousand switches should get
      // its commands out before a thousand rows are formatted.
      if (queue.size === options.maxBatch) setImmediate(() => void flush());
    },
    acknowledge: (commandId, ackAt, latencyMs) => later(commandId, { ackAt, latencyMs }),
    withdraw: (commandId, at) => later(commandId, { withdrawnAt: at }),
    present(plugId, state) {
      // Columns set since the last write are kept: one row per plug and flush.
      present.set(plugId, { ...present.get(plugId), ...state });
    },
    meter(plugId, at, wattHours) {
      samples.push({ plugId, at, wattHours });
    },
    async flush() {
      await running;
      await flush(true);
    },
    waiting: () => queue.size + acks.size + present.size + samples.length,
    async close() {
      if (closed) return;
      closed = true;
      clearInterval(timer);
      await running;
      await flush(true);
      if (queue.size || acks.size || present.size) logger.error({ rows: queue.size + acks.size + present.size }, "switch log closed with rows unwritten");
    },
  };
}
