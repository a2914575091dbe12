import { describe, expect, it } from "vitest";
import type { Database } from "@/db/client";
import { isLockConflict, transactionWithRetry } from "@/db/transaction";

// mysql2 wraps MariaDB's errors; Drizzle puts the driver's error in `cause`.
const lockError = (code: string) => Object.assign(new Error("Failed query"), { cause: Object.assign(new Error(code), { code }) });

function fakeDb(failures: unknown[]) {
  let calls = 0;
  const db = {
    transaction: async (work: (tx: unknown) => Promise<unknown>) => {
      calls++;
      const failure = failures.shift();
      if (failure) throw failure;
      return work({});
    },
  };
  return { db: db as unknown as Database, calls: () => calls };
}

describe("transactionWithRetry", () => {
  it("runs a transaction again after it lost a deadlock or a lock wait", async () => {
    const { db, calls } = fakeDb([lockError("ER_LOCK_DEADLOCK"), lockError("ER_LOCK_WAIT_TIMEOUT")]);
    expect(await transactionWithRetry(db, async () => "done")).toBe("done");
    expect(calls()).toBe(3);
  });

  it("gives up after its attempts, with the last error", async () => {
    const { db, calls } = fakeDb([lockError("ER_LOCK_DEADLOCK"), lockError("ER_LOCK_DEADLOCK")]);
    await expect(transactionWithRetry(db, async () => "done", 2)).rejects.toThrow("Failed query");
    expect(calls()).toBe(2);
  });

  it("does not repeat other errors", async () => {
    const { db, calls } = fakeDb([lockError("ER_DUP_ENTRY")]);
    await expect(transactionWithRetry(db, async () => "done")).rejects.toThrow("Failed query");
    expect(calls()).toBe(1);
    expect(isLockConflict(new Error("plain"))).toBe(false);
  });
});
