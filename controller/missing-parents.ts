// A row waiting to be written whose plug, sensor, override or person was deleted in the
// app meanwhile would fail its foreign key on every retry, and hold back every row
// behind it. The writers ask which ids are still there and drop (or unlink) the rest.
import { inArray } from "drizzle-orm";
import type { MySqlColumn, MySqlTable } from "drizzle-orm/mysql-core";
import type { Database } from "@/db/client";

/** MariaDB's "Cannot add or update a child row: a foreign key constraint fails". */
export function isMissingParent(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, errno } = e as { code?: unknown; errno?: unknown };
    if (code === "ER_NO_REFERENCED_ROW_2" || code === "ER_NO_REFERENCED_ROW" || errno === 1452 || errno === 1216) return true;
  }
  return false;
}

/** Which of `ids` are still rows of `table` (by its `id` column). */
export async function stillThere(db: Database, table: MySqlTable, id: MySqlColumn, ids: Iterable<string | null | undefined>): Promise<Set<string>> {
  const wanted = [...new Set([...ids].filter((x): x is string => typeof x === "string"))];
  if (wanted.length === 0) return new Set();
  const rows = (await db.select({ id }).from(table).where(inArray(id, wanted))) as { id: string }[];
  return new Set(rows.map((r) => r.id));
}
