import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { env } from "@/lib/server/env";
import { poolWithDeadlines } from "./deadline";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;

type Connection = { pool: mysql.Pool; db: Database };

export type ConnectOptions = {
  /**
   * The longest wait for one statement, and for a connection from the pool. A database
   * that hangs then costs a caller this long, not for as long as it hangs. Migrations
   * and one-off scripts may pass Infinity.
   */
  timeoutMs?: number;
};

/** The web app's deadline: long enough for the heaviest report, short enough for a page to say what is wrong. */
export const WEB_DATABASE_TIMEOUT_MS = 5000;

export function createPool(url: string, options: ConnectOptions = {}) {
  const timeoutMs = options.timeoutMs ?? WEB_DATABASE_TIMEOUT_MS;
  const pool = mysql.createPool({
    uri: url,
    timezone: "Z",
    connectionLimit: 10,
    // DECIMAL columns come back as numbers through drizzle's mode: "number".
    supportBigNumbers: true,
    enableKeepAlive: true,
    // A server that accepts the connection but never greets (a stopped process) is given up on.
    connectTimeout: Number.isFinite(timeoutMs) ? Math.min(timeoutMs, 10_000) : 10_000,
  });
  return Number.isFinite(timeoutMs) ? poolWithDeadlines(pool, timeoutMs) : pool;
}

export function connect(url: string, options: ConnectOptions = {}): Connection {
  const pool = createPool(url, options);
  return { pool, db: drizzle({ client: pool, schema, mode: "default", casing: "snake_case" }) };
}

function connection(): Connection {
  holder.__clocheDb ??= connect(env().DATABASE_URL, { timeoutMs: env().CLOCHE_DB_TIMEOUT_MS });
  return holder.__clocheDb;
}

// One pool per process; kept on globalThis so Next's dev reloads do not open new ones.
const holder = globalThis as unknown as { __clocheDb?: Connection };

export function getDb(): Database {
  return connection().db;
}

export function getPool(): mysql.Pool {
  return connection().pool;
}

export async function closeDb() {
  const current = holder.__clocheDb;
  holder.__clocheDb = undefined;
  await current?.pool.end();
}
