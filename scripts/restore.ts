// `npm run restore -- FILE`: replaces Cloche's database with a backup made by
// `npm run backup`, after saying what will be replaced and asking.
//
//   npm run restore -- FILE                  replace the database (DATABASE_URL, or the private one)
//   npm run restore -- FILE --database NAME  restore into NAME on the same server instead
//   npm run restore -- FILE --yes            do not ask (for scripts)
//
// The file is read through and checked before anything changes; it is loaded into a new
// database and checked there; only then do its tables replace the target's, in one
// step. What is replaced is first saved as a backup of its own. Refuses while a
// controller is running against the target: stop `npm start` first and start only
// the database with `npm run db:start`.
import { createInterface } from "node:readline/promises";
import path from "node:path";
import type mysql from "mysql2/promise";
import { CONTROLLER_SILENT_AFTER_MS } from "../lib/control/heartbeat";
import { defaultBackupFolder, formatSize } from "./backup/files";
import {
  BackupError,
  MAIN_TABLES,
  MIGRATIONS_TABLE,
  baseTables,
  connectTo,
  databaseExists,
  databaseTarget,
  formatCounts,
  mariadbProgram,
  privateRootLogin,
  quoteName,
  rowCounts,
} from "./backup/database";
import { readBackup, type BackupFile } from "./backup/read-backup";
import { loadAndSwapIn } from "./backup/swap-in";
import { writeBackup } from "./backup/write-backup";

type Options = { file: string; yes: boolean; database: string | null };

const USAGE = "Use: npm run restore -- FILE [--database NAME] [--yes]";

function parseArgs(argv: string[]): Options {
  const files: string[] = [];
  let yes = false;
  let database: string | null = null;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (arg === "--yes" || arg === "-y") yes = true;
    else if (arg === "--database" || arg.startsWith("--database=")) {
      const value = arg.includes("=") ? arg.slice("--database=".length) : argv[++i];
      if (!value) throw new BackupError(`--database needs a name. ${USAGE}`);
      if (!/^[A-Za-z0-9_]{1,40}$/.test(value)) {
        throw new BackupError(`--database ${value}: use letters, digits and _ only, at most 40 characters.`);
      }
      database = value;
    } else if (arg.startsWith("-")) throw new BackupError(`Unknown option ${arg}. ${USAGE}`);
    else files.push(arg);
  }
  if (files.length !== 1) throw new BackupError(files.length ? `Give one file, not ${files.length}. ${USAGE}` : `Which backup? ${USAGE}`);
  return { file: path.resolve(files[0]!), yes, database };
}

/** A controller that beat lately and has not stopped is switching plugs from this database. */
async function runningController(connection: mysql.Connection, database: string) {
  const [rows] = await connection.query(
    `SELECT host, pid, TIMESTAMPDIFF(SECOND, beat_at, UTC_TIMESTAMP(3)) AS ago FROM ${quoteName(database)}.controller_heartbeats
     WHERE stopped_at IS NULL AND beat_at > UTC_TIMESTAMP(3) - INTERVAL ? SECOND ORDER BY beat_at DESC LIMIT 1`,
    [CONTROLLER_SILENT_AFTER_MS / 1000],
  );
  return (rows as { host: string; pid: number; ago: number }[])[0] ?? null;
}

function describeFile(backup: BackupFile) {
  const main = new Map(MAIN_TABLES.filter((t) => backup.rows.has(t)).map((t) => [t, backup.rows.get(t)!]));
  return [
    `  from ${backup.file}`,
    `    backup of database ${backup.header.database}, made ${backup.header.madeAt.toISOString().replace(/\.\d{3}Z$/, "Z")} (${formatSize(backup.bytes)})`,
    "    rows in its main tables:",
    formatCounts(main, "      "),
  ].join("\n");
}

async function confirm(question: string) {
  const rl = createInterface({ input: process.stdin, output: process.stdout });
  try {
    return (await rl.question(question)).trim().toLowerCase() === "yes";
  } finally {
    rl.close();
  }
}

async function main() {
  const began = Date.now();
  const options = parseArgs(process.argv.slice(2));
  const log = (line: string) => console.log(`[restore] ${line}`);
  // Everything about the file is checked before the database is touched.
  const backup = await readBackup(options.file);
  const url = databaseTarget();
  const target = options.database ?? url.database;
  // The app's user may use its own database only; the private MariaDB's root may make the new one.
  const admin = privateRootLogin(url.login) ?? url.login;
  const mariadb = mariadbProgram("mariadb", log);
  const dump = mariadbProgram("mariadb-dump", log);

  const connection = await connectTo(admin).catch((error: Error) => {
    throw new BackupError(`Could not reach the database server at ${url.where}: ${error.message}`);
  });
  let replacing: { counts: Map<string, number> } | null = null;
  let exists = false;
  try {
    exists = await databaseExists(connection, target);
    if (exists) {
      const tables = (await baseTables(connection, target)).map((t) => t.name);
      if (tables.length && !tables.includes(MIGRATIONS_TABLE)) {
        throw new BackupError(`Database ${target} on ${url.where} holds tables that are not Cloche's; not replacing it. Choose another with --database NAME.`);
      }
      if (tables.includes("controller_heartbeats")) {
        const controller = await runningController(connection, target);
        if (controller) {
          throw new BackupError(
            `A controller is running against database ${target} (pid ${controller.pid} on ${controller.host}, last heartbeat ${controller.ago} s ago). ` +
              "Stop `npm start` first (Ctrl-C), start only the database with `npm run db:start`, and run the restore again.",
          );
        }
      }
      if (tables.length) replacing = { counts: await rowCounts(connection, target, MAIN_TABLES) };
    }
  } finally {
    await connection.end();
  }

  const plan = replacing
    ? [`This replaces ALL data in database ${target} on ${url.where}, which now has:`, formatCounts(replacing.counts), "with the backup"]
    : [`This ${exists ? "fills the empty" : "creates"} database ${target} on ${url.where} from the backup`];
  console.log([...plan, describeFile(backup), ""].join("\n"));
  if (!options.yes) {
    if (!process.stdin.isTTY) {
      throw new BackupError("Not restoring: there is no terminal to ask for confirmation on. Add --yes to restore without asking.");
    }
    if (!(await confirm(`Type yes to ${replacing ? "replace" : exists ? "fill" : "create"} database ${target}: `))) {
      console.log("[restore] nothing was changed.");
      return;
    }
  }

  if (replacing) {
    const saved = await writeBackup({ login: admin, database: target, where: url.where }, defaultBackupFolder(), dump);
    log(`saved what is replaced to ${saved.file} (${formatSize(saved.bytes)})`);
  }
  const result = await loadAndSwapIn({ admin, mariadb, target, backup, log });
  const main = new Map(MAIN_TABLES.filter((t) => result.counts.has(t)).map((t) => [t, result.counts.get(t)!]));
  console.log(
    [
      `[restore] database ${target} ${result.created ? "created" : "replaced"} from ${path.basename(backup.file)} in ${((Date.now() - began) / 1000).toFixed(1)} s; rows in its main tables:`,
      formatCounts(main),
      result.migrations < result.knownMigrations
        ? `  The backup is from an older Cloche (${result.migrations} of ${result.knownMigrations} migrations); \`npm start\` applies the rest.`
        : "",
      target === url.database
        ? "  Start Cloche again with `npm start`."
        : admin !== url.login
          ? `  ${target} was made by the private MariaDB's root: Cloche's own user ${url.login.user} may use only ${url.database}.`
          : "",
    ]
      .filter(Boolean)
      .join("\n"),
  );
}

main().catch((error: unknown) => {
  // Every failure comes before the single step that swaps the tables in.
  console.error(error instanceof BackupError ? `[restore] ${error.message}` : error);
  console.error("[restore] The database was not changed.");
  process.exit(1);
});
