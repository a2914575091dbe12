// npm run backup and npm run restore against the test database: a backup restored
// elsewhere has every table's rows and the same switch log; a cut-off or foreign file,
// a missing confirmation and a running controller are refused and change nothing.
import { execFile } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { gunzipSync, gzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { readings, sites, switchEvents } from "@/db/schema";
import { createControlSite } from "@/tests/support/control-site";

const root = path.resolve(import.meta.dirname, "../..");
const tsx = path.join(root, "node_modules", ".bin", "tsx");
const testUrl = new URL(process.env.DATABASE_URL!);
const live = testUrl.pathname.slice(1);
const copy = `${live}_bk_${randomUUID().slice(0, 8)}`;
const folder = mkdtempSync(path.join(tmpdir(), "cloche-backup-test-"));

type Run = { code: number; stdout: string; stderr: string };

function runScript(script: "backup" | "restore", args: string[]): Promise<Run> {
  return new Promise((resolve) => {
    const child = execFile(
      tsx,
      [path.join(root, "scripts", `${script}.ts`), ...args],
      { cwd: root, env: { ...process.env, CLOCHE_BACKUP_DIR: folder }, timeout: 60_000 },
      (error, stdout, stderr) => resolve({ code: error ? Number(error.code ?? 1) : 0, stdout, stderr }),
    );
    child.stdin?.end();
  });
}

let admin: mysql.Connection;

async function tableNames(database: string) {
  const [rows] = await admin.query("SELECT TABLE_NAME AS t FROM information_schema.TABLES WHERE TABLE_SCHEMA = ? AND TABLE_TYPE = 'BASE TABLE' ORDER BY t", [database]);
  return (rows as { t: string }[]).map((r) => r.t);
}

async function everyCount(database: string) {
  const counts: Record<string, number> = {};
  for (const table of await tableNames(database)) {
    const [rows] = await admin.query(`SELECT COUNT(*) AS n FROM \`${database}\`.\`${table}\``);
    counts[table] = Number((rows as { n: number }[])[0]!.n);
  }
  return counts;
}

async function switchLog(database: string) {
  const [rows] = await admin.query(
    `SELECT id, plug_id, command_id, at, from_on, to_on, cause, reading_temp_c, reading_at, ack_at, latency_ms, withdrawn_at
     FROM \`${database}\`.switch_events ORDER BY id`,
  );
  return rows as Record<string, unknown>[];
}

async function checksums(database: string) {
  const tables = await tableNames(database);
  const [rows] = await admin.query(`CHECKSUM TABLE ${tables.map((t) => `\`${database}\`.\`${t}\``).join(", ")}`);
  return rows;
}

async function databasesLike(prefix: string) {
  const [rows] = await admin.query("SELECT SCHEMA_NAME AS s FROM information_schema.SCHEMATA WHERE SCHEMA_NAME LIKE ?", [`${prefix}%`]);
  return (rows as { s: string }[]).map((r) => r.s);
}

let backupFile: string;

beforeAll(async () => {
  admin = await mysql.createConnection({ uri: process.env.DATABASE_URL!, timezone: "Z" });
  const db = getDb();
  const site = await createControlSite(db);
  // Characters outside the basic plane survive only if the dump and load are utf8mb4.
  await db.update(sites).set({ name: "Backup test: Ærø glasshouse 🌱" }).where(eq(sites.id, site.siteId));
  const start = Date.UTC(2026, 10, 1, 6, 0, 0, 123);
  await db.insert(switchEvents).values(
    Array.from({ length: 40 }, (_, i) => ({
      plugId: i % 3 === 0 ? site.lightId : site.heaterId,
      at: new Date(start + i * 61_007),
      fromOn: i === 0 ? null : i % 2 === 1,
      toOn: i % 2 === 0,
      cause: "schedule" as const,
      ratedWatts: 2000,
      readingTempC: i % 5 === 0 ? null : 9.5 + i / 100,
      readingAt: new Date(start + i * 61_007 - 500),
      commandId: `bk-${site.slug}-${i}`,
      ackAt: i % 7 === 0 ? null : new Date(start + i * 61_007 + 250),
      latencyMs: i % 7 === 0 ? null : 250,
      withdrawnAt: i % 7 === 0 ? new Date(start + i * 61_007 + 900) : null,
    })),
  );
  await db.insert(readings).values(
    Array.from({ length: 300 }, (_, i) => ({ sensorId: site.sensorId, at: new Date(start + i * 60_000), tempC: 8 + (i % 50) / 10, rh: 70.25, battery: 0.875 })),
  );
}, 60_000);

afterAll(async () => {
  for (const name of await databasesLike(copy)) await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await admin.end();
  rmSync(folder, { recursive: true, force: true });
});

describe("npm run backup and npm run restore", () => {
  it("backs up the test database to a dated file, restores it elsewhere with every row and the same switch log", async () => {
    const backup = await runScript("backup", ["--to", folder]);
    expect(backup.stderr).toBe("");
    expect(backup.code).toBe(0);
    const written = /wrote (\S+)/.exec(backup.stdout)?.[1];
    expect(written).toMatch(new RegExp(`/${live}-\\d{4}-\\d{2}-\\d{2}T\\d{2}-\\d{2}-\\d{2}Z\\.sql\\.gz$`));
    backupFile = written!;
    expect(readdirSync(folder).filter((f) => f.startsWith("."))).toEqual([]);
    const liveCounts = await everyCount(live);
    expect(backup.stdout).toContain(`switch_events  ${liveCounts.switch_events!.toLocaleString("en")}`);

    const restore = await runScript("restore", [backupFile, "--yes", "--database", copy]);
    expect(restore.stderr).toBe("");
    expect(restore.code).toBe(0);
    expect(restore.stdout).toContain(`database ${copy} created`);

    expect(await everyCount(copy)).toEqual(liveCounts);
    const log = await switchLog(copy);
    expect(log.length).toBeGreaterThanOrEqual(40);
    expect(log).toEqual(await switchLog(live));
    const [[name]] = (await admin.query(`SELECT name FROM \`${copy}\`.sites WHERE name LIKE 'Backup test:%'`)) as unknown as [{ name: string }[]];
    expect(name!.name).toBe("Backup test: Ærø glasshouse 🌱");
    expect(await databasesLike(`${copy}_`)).toEqual([]);
  });

  it("replaces an existing database after saving what it replaces", async () => {
    await admin.query(`DELETE FROM \`${copy}\`.readings`);
    const before = readdirSync(folder).length;
    const restore = await runScript("restore", [backupFile, "--yes", "--database", copy]);
    expect(restore.code).toBe(0);
    expect(restore.stdout).toContain(`This replaces ALL data in database ${copy}`);
    expect(restore.stdout).toMatch(/readings\s+0\n/);
    expect(restore.stdout).toContain(`database ${copy} replaced`);
    expect(await everyCount(copy)).toEqual(await everyCount(live));
    // The saved copy holds what was replaced: the emptied readings.
    const saved = /saved what is replaced to (\S+)/.exec(restore.stdout)?.[1];
    expect(readdirSync(folder).length).toBe(before + 1);
    expect(gunzipSync(readFileSync(saved!)).toString()).not.toContain("INSERT INTO `readings`");
    expect(await databasesLike(`${copy}_`)).toEqual([]);
  });

  it("refuses a cut-off file and leaves the target as it was", async () => {
    const unchanged = await checksums(copy);
    const gz = readFileSync(backupFile);
    const halfGz = path.join(folder, "half.sql.gz");
    writeFileSync(halfGz, gz.subarray(0, Math.floor(gz.length / 2)));
    const text = gunzipSync(gz).toString();
    const lastInsert = text.lastIndexOf("INSERT INTO");
    const endless = path.join(folder, "no-end.sql.gz");
    writeFileSync(endless, gzipSync(text.slice(0, text.indexOf("\n", lastInsert + 2000))));

    const half = await runScript("restore", [halfGz, "--yes", "--database", copy]);
    expect(half.code).toBe(1);
    expect(half.stderr).toContain("it is cut off or damaged");
    const noEnd = await runScript("restore", [endless, "--yes", "--database", copy]);
    expect(noEnd.code).toBe(1);
    expect(noEnd.stderr).toMatch(/it is cut off/);
    expect(noEnd.stderr).toContain("The database was not changed.");

    expect(await checksums(copy)).toEqual(unchanged);
    expect(await databasesLike(`${copy}_`)).toEqual([]);
  });

  it("drops the half-loaded new database when the file fails to load, and leaves the target as it was", async () => {
    const unchanged = await checksums(copy);
    const text = gunzipSync(readFileSync(backupFile)).toString();
    // Complete in form, but its last statement fails after most tables are loaded.
    const end = text.lastIndexOf("-- Dump completed");
    const broken = path.join(folder, "broken.sql.gz");
    writeFileSync(broken, gzipSync(`${text.slice(0, end)}INSERT INTO \`no_such_table\` VALUES (1);\n${text.slice(end)}`));

    const run = await runScript("restore", [broken, "--yes", "--database", copy]);
    expect(run.code).toBe(1);
    expect(run.stdout).toContain(`loading broken.sql.gz into ${copy}_restoring_`);
    expect(run.stderr).toMatch(/mariadb failed \(exit 1\): ERROR 1146 .*no_such_table' doesn't exist\n/);
    expect(run.stderr).toContain("The database was not changed.");
    expect(await checksums(copy)).toEqual(unchanged);
    expect(await databasesLike(`${copy}_`)).toEqual([]);
  });

  it("refuses files that are not Cloche backups, in a plain sentence", async () => {
    const plain = path.join(folder, "notes.txt");
    writeFileSync(plain, "Tomatoes in bed 3\n");
    const other = path.join(folder, "other.sql.gz");
    writeFileSync(other, gzipSync("-- MariaDB dump 10.19\nCREATE TABLE t (a int);\n-- Dump completed on 2026-12-01 10:00:00\n"));
    const unchanged = await checksums(copy);

    const a = await runScript("restore", [plain, "--yes", "--database", copy]);
    expect(a.code).toBe(1);
    expect(a.stderr).toContain(`${plain} is not a Cloche backup: it is not gzip-compressed`);
    const b = await runScript("restore", [other, "--yes", "--database", copy]);
    expect(b.code).toBe(1);
    expect(b.stderr).toContain("it is not a Cloche backup");
    const c = await runScript("restore", [path.join(folder, "missing.sql.gz"), "--yes", "--database", copy]);
    expect(c.stderr).toContain("There is no file");
    expect(await checksums(copy)).toEqual(unchanged);
  });

  it("asks before replacing, and refuses without a terminal to ask on or while a controller runs", async () => {
    const unchanged = await checksums(copy);
    const noTty = await runScript("restore", [backupFile, "--database", copy]);
    expect(noTty.code).toBe(1);
    expect(noTty.stdout).toContain(`This replaces ALL data in database ${copy}`);
    expect(noTty.stderr).toContain("there is no terminal to ask for confirmation on. Add --yes");
    expect(await checksums(copy)).toEqual(unchanged);

    await admin.query(
      `INSERT INTO \`${copy}\`.controller_heartbeats (instance_id, host, pid, started_at, beat_at) VALUES (?, 'glasshouse-pi', 4242, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))`,
      [`bk-${randomUUID()}`],
    );
    const running = await runScript("restore", [backupFile, "--yes", "--database", copy]);
    expect(running.code).toBe(1);
    expect(running.stderr).toContain(`A controller is running against database ${copy} (pid 4242 on glasshouse-pi`);
    expect(running.stderr).toContain("Stop `npm start` first");
    await admin.query(`DELETE FROM \`${copy}\`.controller_heartbeats WHERE pid = 4242`);
    expect(await checksums(copy)).toEqual(unchanged);
  });

  it("says what is wrong with its arguments", async () => {
    expect((await runScript("backup", ["--keep-days", "0"])).stderr).toContain("--keep-days 0: give a whole number of days from 1 to 3650.");
    expect((await runScript("backup", ["--bogus"])).stderr).toContain('Unknown argument "--bogus"');
    expect((await runScript("restore", [])).stderr).toContain("Which backup?");
    expect((await runScript("restore", [backupFile, "--database", "bad-name"])).stderr).toContain("--database bad-name: use letters, digits and _ only");
  });
});
