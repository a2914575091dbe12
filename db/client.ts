import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { env } from "@/lib/server/env";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;

type Connection = { pool: mysql.Pool; db: Database };

// One pool per process; kept on globalThis so Next's dev reloads do not open new ones.
const holder = globalThis as unknown as { __clocheDb?: Connection };

export function createPool(url: string) {
  return mysql.createPool({
    uri: url,
    timezone: "Z",
    connectionLimit: 10,
    // DECIMAL columns come back as numbers through drizzle's mode: "number".
    supportBigNumbers: true,
    enableKeepAlive: true,
  });
}

export function connect(url: string): Connection {
  const pool = createPool(url);
  return { pool, db: drizzle({ client: pool, schema, mode: "default", casing: "snake_case" }) };
}

function connection(): Connection {
  holder.__clocheDb ??= connect(env().DATABASE_URL);
  return holder.__clocheDb;
}

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
