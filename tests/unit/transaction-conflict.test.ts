import { describe, expect, it } from "vitest";
import type { Database } from "@/db/client";
import { transactionOrConflict } from "@/db/transaction";
import { AppError } from "@/lib/errors";

// mysql2 wraps MariaDB's errors; Drizzle puts the driver's error in `cause`.
const lockError = (code: string) => Object.assign(new Error("Failed query"), { cause: Object.assign(new Error(code), { code }) });

function alwaysFailing(error: unknown) {
  let calls = 0;
  const db = {
    transaction: async () => {
      calls++;
      throw error;
    },
  };
  return { db: db as unknown as Database, calls: () => calls };
}

describe("transactionOrConflict", () => {
  it("answers a lock conflict that outlasts every attempt as a 409 in the words given", async () => {
    const { db, calls } = alwaysFailing(lockError("ER_LOCK_DEADLOCK"));
    const failure = await transactionOrConflict(db, async () => "done", "Try again.").catch((error: unknown) => error);
    expect(failure).toBeInstanceOf(AppError);
    expect((failure as AppError).code).toBe("conflict");
    expect((failure as AppError).message).toBe("Try again.");
    expect(calls()).toBe(6);
  });

  it("passes other errors on as they are, after one attempt", async () => {
    const { db, calls } = alwaysFailing(lockError("ER_DUP_ENTRY"));
    await expect(transactionOrConflict(db, async () => "done", "Try again.")).rejects.toThrow("Failed query");
    expect(calls()).toBe(1);
  });
});
