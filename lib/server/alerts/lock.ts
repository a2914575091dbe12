// One notifier at a time across processes: a MariaDB named lock taken without waiting.
// A second web app process (or a test's second notifier) finds it taken and skips its pass.
import { getPool } from "@/db/client";

export const NOTIFIER_LOCK = "cloche.alert-notifier";

/** Runs `work` while holding the named lock; returns null without running it when another holds it. */
export async function withNotifierLock<T>(work: () => Promise<T>, name = NOTIFIER_LOCK): Promise<{ value: T } | null> {
  const connection = await getPool().getConnection();
  let healthy = true;
  try {
    const [rows] = await connection.query("SELECT GET_LOCK(?, 0) AS got", [name]);
    if ((rows as { got: number | null }[])[0]?.got !== 1) return null;
    try {
      return { value: await work() };
    } finally {
      // A lock that could not be released must not stay with a pooled connection:
      // closing the connection releases it.
      await connection.query("SELECT RELEASE_LOCK(?)", [name]).catch(() => (healthy = false));
    }
  } finally {
    if (healthy) connection.release();
    else connection.destroy();
  }
}
