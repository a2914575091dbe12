// Keeps the energy roll-up current behind the switch log: the days each written batch
// touches are made again from the log a moment later, a few batches at once. Nothing
// on the control path waits for it; while MariaDB is away the changes are kept and
// retried with back-off.
import type { Logger } from "pino";
import { logDetail } from "@/lib/database-errors";
import type { Database } from "@/db/client";
import { refreshEnergyDays, type EnergyChange } from "@/db/energy-days";

export type EnergyRollupOptions = {
  db: Database;
  logger: Logger;
  /** How long changes gather before the roll-up is brought up to date. */
  delayMs: number;
};

export type EnergyRollup = {
  changed: (changes: readonly EnergyChange[]) => void;
  /** Brings the roll-up up to date with every change so far. */
  flush: () => Promise<void>;
  waiting: () => number;
  close: () => Promise<void>;
};

export function createEnergyRollup({ db, logger, delayMs }: EnergyRollupOptions): EnergyRollup {
  let pending = new Map<string, EnergyChange>();
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> | undefined;
  let failures = 0;
  let closed = false;

  function merge(into: Map<string, EnergyChange>, c: EnergyChange) {
    const seen = into.get(c.plugId);
    into.set(c.plugId, seen ? { plugId: c.plugId, fromMs: Math.min(seen.fromMs, c.fromMs), toMs: Math.max(seen.toMs, c.toMs) } : { ...c });
  }

  function schedule(ms: number) {
    if (timer || closed) return;
    timer = setTimeout(() => {
      timer = undefined;
      void run();
    }, ms);
    timer.unref();
  }

  function run(): Promise<void> {
    if (running) return running;
    if (pending.size === 0) return Promise.resolve();
    const batch = pending;
    pending = new Map();
    running = refreshEnergyDays(db, [...batch.values()])
      .then(() => {
        if (failures > 0) logger.info({ failures }, "energy roll-up is up to date again");
        failures = 0;
      })
      .catch((error: unknown) => {
        failures++;
        for (const c of batch.values()) merge(pending, c);
        logger.error({ ...logDetail(error), plugs: pending.size, failures }, "energy roll-up refresh failed; will try again");
      })
      .finally(() => {
        running = undefined;
        if (pending.size) schedule(failures ? Math.min(60_000, delayMs * 2 ** Math.min(failures, 8)) : delayMs);
      });
    return running;
  }

  return {
    changed(changes) {
      for (const c of changes) merge(pending, c);
      schedule(delayMs);
    },
    async flush() {
      await running;
      await run();
    },
    waiting: () => pending.size,
    async close() {
      if (closed) return;
      closed = true;
      clearTimeout(timer);
      timer = undefined;
      await running;
      await run().catch(() => undefined);
    },
  };
}
