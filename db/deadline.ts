// Every statement through a pool gets a deadline, and so does the wait for a
// connection. A MariaDB that hangs (stopped, swapping, a lock held for ever) answers
// nothing and closes nothing: without a deadline a caller would wait for as long as it
// hangs. On a deadline the connection is destroyed, not put back, so the statement
// still queued on it cannot hold up whoever takes it next.
import type { Pool, PoolConnection } from "mysql2/promise";
import { DATABASE_TIMEOUT } from "@/lib/database-errors";

/** The database did not answer in time; `code` tells it apart from MariaDB's own errors. */
export class DatabaseTimeoutError extends Error {
  readonly code = DATABASE_TIMEOUT;
  constructor(what: string, ms: number) {
    super(ms > 0 ? `the database did not answer ${what} within ${ms} ms` : `the database is not answering ${what}`);
    this.name = "DatabaseTimeoutError";
  }
}

/** `work` within `ms`, or a DatabaseTimeoutError; `onLate` runs if the deadline won. */
function within<T>(work: Promise<T>, ms: number, what: string, onLate: (late: Promise<T>) => void): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    let late = false;
    const timer = setTimeout(() => {
      late = true;
      onLate(work);
      reject(new DatabaseTimeoutError(what, ms));
    }, ms);
    timer.unref?.();
    work.then(
      (value) => {
        if (late) return;
        clearTimeout(timer);
        resolve(value);
      },
      (error: unknown) => {
        if (late) return;
        clearTimeout(timer);
        reject(error);
      },
    );
  });
}

type Statement = "query" | "execute";

/** A connection taken from the pool in time, or a timeout (one that arrives later goes straight back). */
function acquire(pool: Pool, ms: number): Promise<PoolConnection> {
  return within(pool.getConnection(), ms, "with a free connection", (late) => {
    late.then((connection) => connection.release()).catch(() => undefined);
  });
}

function statementWithin(connection: PoolConnection, method: Statement, args: unknown[], ms: number) {
  const run = (connection[method] as (...a: unknown[]) => Promise<unknown>).apply(connection, args);
  return within(run, ms, "a statement", (late) => {
    late.catch(() => undefined);
    connection.destroy();
  });
}

/** The connection with a deadline on each statement (transactions and named locks use one connection). */
function connectionWithDeadlines(connection: PoolConnection, ms: number, breaker: Breaker): PoolConnection {
  return new Proxy(connection, {
    get(target, property, receiver) {
      if (property === "query" || property === "execute") return (...args: unknown[]) => breaker.guard(() => statementWithin(target, property, args, ms));
      const value = Reflect.get(target, property, receiver) as unknown;
      return typeof value === "function" ? value.bind(target) : value;
    },
  });
}

/**
 * After a deadline passes, callers fail at once instead of each waiting out a deadline
 * of its own, while a probe in the background (`SELECT 1` every `probeEveryMs`, under
 * the same deadline) finds out when the database answers again. Errors that come back
 * at once (refused, connection lost) need no such help and do not trip it.
 */
function createBreaker(probeEveryMs: number, now: () => number, probe: () => Promise<unknown>) {
  let openSince: number | null = null;

  function probeLater() {
    const timer = setTimeout(() => {
      probe().then(
        () => {
          openSince = null;
        },
        () => probeLater(),
      );
    }, probeEveryMs);
    timer.unref?.();
  }

  return {
    async guard<T>(work: () => Promise<T>): Promise<T> {
      if (openSince !== null) throw new DatabaseTimeoutError(`(not answering for ${Math.round((now() - openSince) / 1000)} s)`, 0);
      try {
        return await work();
      } catch (error) {
        if (error instanceof DatabaseTimeoutError && openSince === null) {
          openSince = now();
          probeLater();
        }
        throw error;
      }
    },
  };
}

type Breaker = ReturnType<typeof createBreaker>;

export type DeadlineOptions = { probeEveryMs?: number; now?: () => number };

/** The pool with a deadline of `ms` on every statement and on every wait for a connection. */
export function poolWithDeadlines(pool: Pool, ms: number, options: DeadlineOptions = {}): Pool {
  const breaker = createBreaker(options.probeEveryMs ?? 2000, options.now ?? Date.now, () => statement("query", ["SELECT 1"]));
  async function statement(method: Statement, args: unknown[]) {
    const connection = await acquire(pool, ms);
    let destroyed = false;
    try {
      return await statementWithin(connection, method, args, ms);
    } catch (error) {
      destroyed = error instanceof DatabaseTimeoutError;
      throw error;
    } finally {
      if (!destroyed) connection.release();
    }
  }
  return new Proxy(pool, {
    get(target, property, receiver) {
      if (property === "query" || property === "execute") return (...args: unknown[]) => breaker.guard(() => statement(property, args));
      if (property === "getConnection") return () => breaker.guard(() => acquire(target, ms)).then((connection) => connectionWithDeadlines(connection, ms, breaker));
      const value = Reflect.get(target, property, receiver) as unknown;
      return typeof value === "function" ? value.bind(target) : value;
    },
  });
}
