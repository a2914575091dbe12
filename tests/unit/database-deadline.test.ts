// The pool's deadlines and breaker, against a stand-in pool whose statements hang on
// command: a hung statement is given up on, its connection destroyed, later callers are
// told at once, and one probe at a time finds out when the database answers again.
import { describe, expect, it } from "vitest";
import type { Pool, PoolConnection } from "mysql2/promise";
import { DatabaseTimeoutError, poolWithDeadlines } from "@/db/deadline";
import { isDatabaseUnreachable } from "@/lib/database-errors";
import { AppError, toAppError } from "@/lib/errors";

function standInPool() {
  const state = { hanging: false, destroyed: 0, released: 0, statements: 0 };
  const connection = () =>
    ({
      query: () => {
        state.statements++;
        return state.hanging ? new Promise(() => undefined) : Promise.resolve([[{ one: 1 }], []]);
      },
      execute: () => Promise.resolve([[], []]),
      release: () => void state.released++,
      destroy: () => void state.destroyed++,
    }) as unknown as PoolConnection;
  const pool = { getConnection: () => Promise.resolve(connection()), end: () => Promise.resolve() } as unknown as Pool;
  return { pool, state };
}

describe("a pool with deadlines", () => {
  it("passes answers through and puts the connection back", async () => {
    const { pool, state } = standInPool();
    const guarded = poolWithDeadlines(pool, 50);
    expect(await guarded.query("SELECT 1")).toEqual([[{ one: 1 }], []]);
    expect(state).toMatchObject({ released: 1, destroyed: 0 });
  });

  it("gives up on a hung statement, destroys its connection, fails fast while a probe waits for an answer, then serves again", async () => {
    const { pool, state } = standInPool();
    const guarded = poolWithDeadlines(pool, 50, { probeEveryMs: 30 });
    state.hanging = true;
    const started = performance.now();
    const first = await guarded.query("SELECT 1").catch((e: unknown) => e);
    expect(first).toBeInstanceOf(DatabaseTimeoutError);
    expect(performance.now() - started).toBeGreaterThanOrEqual(45);
    expect(state).toMatchObject({ destroyed: 1, released: 0, statements: 1 });

    // Open: told at once, the database not even asked; only the probe asks it.
    const fastStarted = performance.now();
    for (let i = 0; i < 20; i++) await expect(guarded.query("SELECT 1")).rejects.toBeInstanceOf(DatabaseTimeoutError);
    expect(performance.now() - fastStarted).toBeLessThan(20);
    await new Promise((resolve) => setTimeout(resolve, 200));
    const probes = state.statements - 1;
    expect(probes).toBeGreaterThanOrEqual(1);
    // Each hung probe met its deadline and its connection was destroyed.
    expect(state.destroyed).toBeGreaterThanOrEqual(1 + probes - 1);

    state.hanging = false;
    await new Promise((resolve) => setTimeout(resolve, 150));
    await expect(guarded.query("SELECT 1")).resolves.toEqual([[{ one: 1 }], []]);
  });

  it("puts a deadline on each statement of a connection taken for a transaction", async () => {
    const { pool, state } = standInPool();
    const guarded = poolWithDeadlines(pool, 30);
    const connection = await guarded.getConnection();
    state.hanging = true;
    await expect(connection.query("COMMIT")).rejects.toBeInstanceOf(DatabaseTimeoutError);
    expect(state.destroyed).toBe(1);
  });
});

describe("what the app says about an unreachable database", () => {
  it("is a 503 with a plain sentence, for a timeout, a refusal or a lost connection, however deeply wrapped", () => {
    for (const error of [
      new DatabaseTimeoutError("a statement", 50),
      Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:3316"), { code: "ECONNREFUSED" }),
      new Error("Failed to get session", { cause: new Error("Failed query", { cause: Object.assign(new Error("Connection lost"), { code: "PROTOCOL_CONNECTION_LOST" }) }) }),
    ]) {
      expect(isDatabaseUnreachable(error)).toBe(true);
      const answer = toAppError(error);
      expect(answer).toBeInstanceOf(AppError);
      expect(answer.status).toBe(503);
      expect(answer.message).toMatch(/cannot reach its database/);
    }
  });

  it("leaves statements MariaDB refused as they are", () => {
    const duplicate = Object.assign(new Error("Duplicate entry"), { code: "ER_DUP_ENTRY" });
    expect(isDatabaseUnreachable(duplicate)).toBe(false);
    expect(toAppError(duplicate).status).toBe(500);
  });
});
