// Many rows in one statement, for the write-heavy paths (switch log, readings, device
// presence, demo history). Drizzle's query builder takes about 70 ms to build a
// 1,000-row insert on this machine, longer than MariaDB takes to run it, and that time
// blocks the controller's event loop; a thousand one-row updates cost more still.
// Here mysql2 formats the statement in a few milliseconds; names, value mapping and
// defaults still come from the Drizzle table, and it runs through Drizzle, so
// transactions work as usual.
import { getTableColumns, getTableName, sql, type Column } from "drizzle-orm";
import type { MySqlTable } from "drizzle-orm/mysql-core";
import mysql from "mysql2";

type Executor = { execute: (query: ReturnType<typeof sql.raw>) => Promise<unknown> };

/** Rows per UPDATE statement; updateMany splits longer lists. */
const UPDATE_CHUNK = 1000;

function columnsOf(table: MySqlTable) {
  const all = getTableColumns(table) as Record<string, Column>;
  const column = (key: string) => {
    const found = all[key];
    if (!found) throw new Error(`${getTableName(table)} has no column "${key}"`);
    return found;
  };
  return { all, column };
}

/** A column left out of a row gets its SQL default, as a one-row insert would. */
const SQL_DEFAULT = mysql.raw("DEFAULT");

function driverValue(column: Column, value: unknown): mysql.SqlValue {
  return value === null || value === undefined ? null : (column.mapToDriverValue(value) as mysql.SqlValue);
}

export type OnDuplicate<Row> =
  /** Leave the stored row as it is (a second write of the same key is dropped). */
  | { keep: true }
  /** Take the new value of these columns unless it is NULL. */
  | { fillIn: readonly (keyof Row & string)[] }
  /** Take the new value of these columns, NULL included (every row must name them). */
  | { replace: readonly (keyof Row & string)[] };

export async function insertMany<TTable extends MySqlTable>(
  executor: Executor,
  table: TTable,
  rows: readonly TTable["$inferInsert"][],
  onDuplicate?: OnDuplicate<TTable["$inferInsert"]>,
): Promise<void> {
  if (rows.length === 0) return;
  await run(executor, formatInsert(table, rows, onDuplicate), rows.length);
}

/**
 * Writes many rows keyed by their primary key: new rows are inserted, existing ones get
 * the columns each row names (NULL included) and keep the others. One statement per
 * set of columns named.
 */
export async function upsertMany<TTable extends MySqlTable>(executor: Executor, table: TTable, rows: readonly TTable["$inferInsert"][]): Promise<void> {
  const { all } = columnsOf(table);
  const primary = new Set(Object.entries(all).filter(([, c]) => c.primary).map(([key]) => key));
  const byColumns = new Map<string, TTable["$inferInsert"][]>();
  for (const row of rows) {
    const key = Object.keys(row).sort().join(",");
    const group = byColumns.get(key);
    if (group) group.push(row);
    else byColumns.set(key, [row]);
  }
  for (const group of byColumns.values()) {
    const columns = Object.keys(group[0]!).filter((key) => !primary.has(key)) as (keyof TTable["$inferInsert"] & string)[];
    await insertMany(executor, table, group, columns.length ? { replace: columns } : { keep: true });
  }
}

/**
 * Sets columns of many rows, each found by `key` (a unique column), one UPDATE per
 * thousand rows: `SET c = CASE key WHEN … THEN … ELSE c END … WHERE key IN (…)`.
 */
export async function updateMany<TTable extends MySqlTable, K extends keyof TTable["$inferSelect"] & string>(
  executor: Executor,
  table: TTable,
  key: K,
  rows: readonly (Pick<TTable["$inferSelect"], K> & Partial<TTable["$inferSelect"]>)[],
): Promise<void> {
  for (let i = 0; i < rows.length; i += UPDATE_CHUNK) {
    const chunk = rows.slice(i, i + UPDATE_CHUNK);
    await run(executor, formatUpdate(table, key, chunk), chunk.length);
  }
}

export function formatUpdate<TTable extends MySqlTable, K extends keyof TTable["$inferSelect"] & string>(
  table: TTable,
  key: K,
  rows: readonly (Pick<TTable["$inferSelect"], K> & Partial<TTable["$inferSelect"]>)[],
): string {
  const { column } = columnsOf(table);
  const keyColumn = column(key);
  const keys = rows.map((row) => driverValue(keyColumn, (row as Record<string, unknown>)[key]));
  const changed = new Set<string>();
  for (const row of rows) for (const name of Object.keys(row)) if (name !== key) changed.add(name);
  const sets = [...changed].map((name) => {
    const c = column(name);
    let cases = "";
    rows.forEach((row, i) => {
      if (name in row) cases += mysql.format(" WHEN ? THEN ?", [keys[i]!, driverValue(c, (row as Record<string, unknown>)[name])]);
    });
    return mysql.format("?? = CASE ??", [c.name, keyColumn.name]) + cases + mysql.format(" ELSE ?? END", [c.name]);
  });
  if (sets.length === 0) throw new Error("updateMany: no column to set");
  return mysql.format("UPDATE ?? SET ", [getTableName(table)]) + sets.join(", ") + mysql.format(" WHERE ?? IN (?)", [keyColumn.name, keys]);
}

async function run(executor: Executor, statement: string, rowCount: number) {
  try {
    await executor.execute(sql.raw(statement));
  } catch (error) {
    // The driver attaches the whole statement; a thousand rows of it would flood the log.
    const failed = error as { sql?: unknown; cause?: { sql?: unknown } };
    for (const holder of [failed, failed.cause]) {
      if (holder && typeof holder.sql === "string" && holder.sql.length > 300) holder.sql = `${holder.sql.slice(0, 300)}… (${rowCount} rows)`;
    }
    throw error;
  }
}

export function formatInsert<TTable extends MySqlTable>(
  table: TTable,
  rows: readonly TTable["$inferInsert"][],
  onDuplicate?: OnDuplicate<TTable["$inferInsert"]>,
): string {
  const { all, column } = columnsOf(table);
  // The columns any row names, and those Drizzle would fill in itself (ids, timestamps).
  const keys = new Set<string>();
  for (const row of rows) for (const key of Object.keys(row)) keys.add(key);
  for (const [key, c] of Object.entries(all)) if (c.defaultFn || c.onUpdateFn) keys.add(key);
  const used = [...keys].map((key) => [key, column(key)] as const);
  const values: mysql.SqlValue[][] = rows.map((row) =>
    used.map(([key, c]) => {
      const value = (row as Record<string, unknown>)[key];
      if (value !== undefined) return driverValue(c, value);
      const filled = c.defaultFn ?? c.onUpdateFn;
      if (filled) return driverValue(c, filled());
      return c.hasDefault && !c.primary ? SQL_DEFAULT : null;
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
  } else if (onDuplicate && "replace" in onDuplicate) {
    const sets = onDuplicate.replace.map((key) => {
      const name = column(key).name;
      return mysql.format("?? = VALUES(??)", [name, name]);
    });
    statement += ` ON DUPLICATE KEY UPDATE ${sets.join(", ")}`;
  } else if (onDuplicate) {
    const sets = onDuplicate.fillIn.map((key) => {
      const name = column(key).name;
      return mysql.format("?? = COALESCE(VALUES(??), ??)", [name, name, name]);
    });
    statement += ` ON DUPLICATE KEY UPDATE ${sets.join(", ")}`;
  }
  return statement;
}
