// Loads a checked backup into a new database beside the target, checks what arrived,
// and only then moves its tables into the target in one RENAME TABLE (atomic in
// MariaDB): the target is never half loaded. The target's tables it replaces are moved
// aside in the same statement and dropped afterwards (the caller has saved them).
import { createReadStream, readFileSync } from "node:fs";
import path from "node:path";
import { createGunzip } from "node:zlib";
import type mysql from "mysql2/promise";
import { root } from "../common";
import { BackupError, MIGRATIONS_TABLE, baseTables, connectTo, databaseExists, quoteName, rowCounts, runClient, type Login } from "./database";
import type { BackupFile } from "./read-backup";

const ACCESS_DENIED = new Set(["ER_DBACCESS_DENIED_ERROR", "ER_SPECIFIC_ACCESS_DENIED_ERROR", "ER_TABLEACCESS_DENIED_ERROR"]);

/** Names of the databases a restore makes beside the target; MariaDB allows 64 characters. */
export function sideNames(target: string, at: Date) {
  const stamp = at.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}Z$/, "").replace("T", "");
  const names = { staging: `${target}_restoring_${stamp}`, aside: `${target}_replaced_${stamp}` };
  if (names.aside.length > 64) throw new BackupError(`Database name ${target} is too long to restore beside (at most 40 characters).`);
  return names;
}

function migrationsKnownHere() {
  const journal = JSON.parse(readFileSync(path.join(root, "drizzle", "meta", "_journal.json"), "utf8")) as { entries: unknown[] };
  return journal.entries.length;
}

/** What is in `staging` matches the file row for row, and it is a Cloche database this code can run. */
async function checkLoaded(admin: mysql.Connection, staging: string, backup: BackupFile) {
  const tables = (await baseTables(admin, staging)).map((t) => t.name);
  const missing = backup.tables.filter((t) => !tables.includes(t));
  if (missing.length) throw new BackupError(`After loading, tables ${missing.join(", ")} are missing.`);
  if (!tables.includes(MIGRATIONS_TABLE)) throw new BackupError(`The backup has no ${MIGRATIONS_TABLE} table, so it is not of a Cloche database.`);
  const counts = await rowCounts(admin, staging, tables);
  for (const [table, expected] of backup.rows) {
    if (counts.get(table) !== expected) {
      throw new BackupError(`After loading, ${table} has ${counts.get(table)} rows where the file has ${expected}.`);
    }
  }
  const migrations = counts.get(MIGRATIONS_TABLE) ?? 0;
  if (migrations === 0) throw new BackupError(`The backup's ${MIGRATIONS_TABLE} table is empty, so it is not of a Cloche database.`);
  const known = migrationsKnownHere();
  if (migrations > known) {
    throw new BackupError(`The backup was made by a newer Cloche (${migrations} migrations applied; this version knows ${known}). Update Cloche first.`);
  }
  return { counts, migrations, known };
}

export type SwapResult = { counts: Map<string, number>; migrations: number; knownMigrations: number; created: boolean };

export async function loadAndSwapIn(o: {
  admin: Login;
  mariadb: string;
  target: string;
  backup: BackupFile;
  log: (line: string) => void;
}): Promise<SwapResult> {
  const { staging, aside } = sideNames(o.target, new Date());
  const connection = await connectTo(o.admin);
  let stagingMade = false;
  let asideMade = false;
  let targetMade = false;
  let swapped = false;
  try {
    try {
      await connection.query(`CREATE DATABASE ${quoteName(staging)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
      stagingMade = true;
    } catch (error) {
      if (!ACCESS_DENIED.has((error as { code?: string }).code ?? "")) throw error;
      throw new BackupError(
        `User ${o.admin.user} may not create database ${staging}: a restore loads the file into a new database first. ` +
          `Restore as a user that may create databases named ${o.target}_… (set DATABASE_URL).`,
      );
    }
    o.log(`loading ${path.basename(o.backup.file)} into ${staging}…`);
    const input = createGunzip();
    createReadStream(o.backup.file)
      .on("error", (error) => input.destroy(error))
      .pipe(input);
    await runClient(o.mariadb, o.admin, ["--default-character-set=utf8mb4", `--database=${staging}`], { input });
    const checked = await checkLoaded(connection, staging, o.backup);
    o.log(`checked ${staging}: every table has the rows the file has`);

    const created = !(await databaseExists(connection, o.target));
    if (created) {
      await connection.query(`CREATE DATABASE ${quoteName(o.target)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
      targetMade = true;
    }
    const current = (await baseTables(connection, o.target)).map((t) => t.name);
    if (current.length) {
      await connection.query(`CREATE DATABASE ${quoteName(aside)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
      asideMade = true;
    }
    const incoming = (await baseTables(connection, staging)).map((t) => t.name);
    const moves = [
      ...current.map((t) => `${quoteName(o.target)}.${quoteName(t)} TO ${quoteName(aside)}.${quoteName(t)}`),
      ...incoming.map((t) => `${quoteName(staging)}.${quoteName(t)} TO ${quoteName(o.target)}.${quoteName(t)}`),
    ];
    // One statement: every table moves, or (on any error) none does.
    await connection.query(`RENAME TABLE ${moves.join(", ")}`);
    swapped = true;
    return { counts: checked.counts, migrations: checked.migrations, knownMigrations: checked.known, created };
  } finally {
    // What is left beside the target after a swap, or after a failure before it, is not needed.
    if (stagingMade) await connection.query(`DROP DATABASE IF EXISTS ${quoteName(staging)}`).catch(() => {});
    if (asideMade) await connection.query(`DROP DATABASE IF EXISTS ${quoteName(aside)}`).catch(() => {});
    if (targetMade && !swapped) await connection.query(`DROP DATABASE IF EXISTS ${quoteName(o.target)}`).catch(() => {});
    await connection.end();
  }
}
