// A transaction that InnoDB picks as a deadlock victim is rolled back whole, and
// MariaDB's own advice is to run it again ("Deadlock found when trying to get lock; try
// restarting transaction"). The web app's writes that lock a plug row meet the
// controller's switch-log writes, which take shared locks on the same rows through their
// foreign keys; they are run through here.
import type { Database } from "@/db/client";
import { AppError } from "@/lib/errors";

type Work<T> = Parameters<Database["transaction"]>[0] extends (tx: infer Tx) => Promise<unknown> ? (tx: Tx) => Promise<T> : never;

const RETRYABLE = new Set(["ER_LOCK_DEADLOCK", "ER_LOCK_WAIT_TIMEOUT"]);

export function isLockConflict(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string } })?.cause ?? error;
  return RETRYABLE.has((cause as { code?: string })?.code ?? "");
}

/**
 * Runs `work` in a transaction, again (up to `attempts` times in all) when it lost a
 * deadlock. `work` must start from scratch each time. The waits double with a random
 * share (about 10, 20, 40, 80, 160 ms), so that many writers colliding at once (fifty
 * override presses in flight) spread out instead of meeting again.
 */
export async function transactionWithRetry<T>(db: Database, work: Work<T>, attempts = 6): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return (await db.transaction(work as never)) as T;
    } catch (error) {
      if (attempt >= attempts || !isLockConflict(error)) throw error;
      const base = 10 * 2 ** (attempt - 1);
      await new Promise((resolve) => setTimeout(resolve, base / 2 + Math.random() * base));
    }
  }
}

/** The same, with a lock conflict that outlasted every attempt answered as a 409 in `message`'s words. */
export async function transactionOrConflict<T>(db: Database, work: Work<T>, message: string): Promise<T> {
  try {
    return await transactionWithRetry(db, work);
  } catch (error) {
    if (isLockConflict(error)) throw new AppError("conflict", message);
    throw error;
  }
}
