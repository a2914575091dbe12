// A transaction that InnoDB picks as a deadlock victim is rolled back whole, and
// MariaDB's own advice is to run it again ("Deadlock found when trying to get lock; try
// restarting transaction"). The web app's writes that lock a plug row meet the
// controller's switch-log writes, which take shared locks on the same rows through their
// foreign keys; they are run through here.
import type { Database } from "@/db/client";

type Work<T> = Parameters<Database["transaction"]>[0] extends (tx: infer Tx) => Promise<unknown> ? (tx: Tx) => Promise<T> : never;

const RETRYABLE = new Set(["ER_LOCK_DEADLOCK", "ER_LOCK_WAIT_TIMEOUT"]);

export function isLockConflict(error: unknown): boolean {
  const cause = (error as { cause?: { code?: string } })?.cause ?? error;
  return RETRYABLE.has((cause as { code?: string })?.code ?? "");
}

/** Runs `work` in a transaction, again (up to `attempts` times in all) when it lost a deadlock. `work` must start from scratch each time. */
export async function transactionWithRetry<T>(db: Database, work: Work<T>, attempts = 3): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return (await db.transaction(work as never)) as T;
    } catch (error) {
      if (attempt >= attempts || !isLockConflict(error)) throw error;
      await new Promise((resolve) => setTimeout(resolve, 5 * attempt + Math.random() * 10));
    }
  }
}
