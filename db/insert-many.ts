// Multi-row INSERTs for the write-heavy paths (switch log, readings, demo history).
// Drizzle's query builder takes about 70 ms to build a 1,000-row insert on this
// machine, longer than MariaDB takes to run it, and that time blocks the controller's
// event loop. Here the statement is formatted by mysql2 in a few milliseconds; names,
// value mapping and defaults still come from the Drizzle table, and it runs through
// Drizzle, so transactions work as usual.
import { getTableColumns, getTableName, sql, type Column } from "drizzle-orm";
import type { MySqlTable } from "drizzle-orm/mysql-core";
import mysql from "mysql2";

type Executor = { execute: (query: ReturnType<typeof sql.raw>) => Promise<unknown> };

export type OnDuplicate<Row> =
  /** Leave the stored row as it is (a second write of the same key is dropped). */
  | { keep: true }
  /** Take the new value of these columns unless it is NULL. */
  | { fillIn: readonly (keyof Row & string)[] };

export async function insertMany<TTable extends MySqlTable>(
  executor: Executor,
  table: TTable,
  rows: readonly TTable["$inferInsert"][],
  onDuplicate?: OnDuplicate<TTable["$inferInsert"]>,
): Promise<void> {
  if (rows.length === 0) return;
  const statement = formatInsert(table, rows, onDuplicate);
  await executor.execute(sql.raw(statement));
}

export function formatInsert<TTable extends MySqlTable>(
  table: TTable,
  rows: readonly TTable["$inferInsert"][],
  onDuplicate?: OnDuplicate<TTable["$inferInsert"]>,
): string {
  const all = getTableColumns(table) as Record<string, Column>;
  const keys = new Set<string>();
  for (const row of rows) for (const key of Object.keys(row)) keys.add(key);
  const used = [...keys].map((key) => {
    const column = all[key];
    if (!column) throw new Error(`${getTableName(table)} has no column "${key}"`);
    return [key, column] as const;
  });
  const values: mysql.SqlValue[][] = rows.map((row) =>
    used.map(([key, column]) => {
      const value = (row as Record<string, unknown>)[key];
      if (value !== undefined && value !== null) return column.mapToDriverValue(value) as mysql.SqlValue;
      if (value === null) return null;
      if (column.defaultFn) return column.mapToDriverValue(column.defaultFn()) as mysql.SqlValue;
      if (column.hasDefault && !column.primary) throw new Error(`insertMany cannot write the SQL default of ${column.name}; give it a value`);
      return null;
    }),
  );
  let statement = mysql.format(
    "INSERT INTO ?? (??) VALUES ?",
    [getTableName(table), used.map(([, c]) => c.name), values],
    false,
    "Z",
  );
  if (onDuplicate && "keep" in onDuplicate) {
    const first = used[0]![1].name;
    statement += mysql.format(" ON DUPLICATE KEY UPDATE ?? = ??", [first, first]);
  } else if (onDuplicate) {
    const sets = onDuplicate.fillIn.map((key) => {
      const name = all[key]?.name;
      if (!name) throw new Error(`${getTableName(table)} has no column "${key}"`);
      return mysql.format("?? = COALESCE(VALUES(??), ??)", [name, name, name]);
    });
    statement += ` ON DUPLICATE KEY UPDATE ${sets.join(", ")}`;
  }
  return statement;
}
