// `npm run backup`: a consistent dump of Cloche's database (mariadb-dump in one
// transaction) to a dated, gzipped file.
//
//   npm run backup                        into .data/backups (or CLOCHE_BACKUP_DIR)
//   npm run backup -- --to DIR            into DIR
//   npm run backup -- --keep-days N       then delete this database's backups older than N days
//
// Backs up DATABASE_URL, or the private database of a running `npm start`. Safe while
// Cloche runs: the dump reads one snapshot and takes no table locks.
import { closeSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import { createWriteStream } from "node:fs";
import { dataFolder } from "./common";
import { backupFileName, pruneBackups } from "./backup/files";
import { BackupError, MAIN_TABLES, MIGRATIONS_TABLE, baseTables, connectTo, databaseTarget, formatCounts, mariadbProgram, runClient } from "./backup/database";
import { DumpFormatError, DumpScanner, backupHeader } from "./backup/dump-format";

type Options = { folder: string; keepDays: number | null };

function parseArgs(argv: string[]): Options {
  let folder = process.env.CLOCHE_BACKUP_DIR || path.join(dataFolder, "backups");
  let keepDays: number | null = null;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    const [name, inline] = arg.startsWith("--") && arg.includes("=") ? [arg.slice(0, arg.indexOf("=")), arg.slice(arg.indexOf("=") + 1)] : [arg, undefined];
    const value = () => {
      const v = inline ?? argv[++i];
      if (v === undefined || v === "") throw new BackupError(`${name} needs a value.`);
      return v;
    };
    if (name === "--to") folder = path.resolve(value());
    else if (name === "--keep-days") {
      const raw = value();
      if (!/^\d+$/.test(raw) || Number(raw) < 1 || Number(raw) > 3650) {
        throw new BackupError(`--keep-days ${raw}: give a whole number of days from 1 to 3650.`);
      }
      keepDays = Number(raw);
    } else throw new BackupError(`Unknown argument ${JSON.stringify(arg)}. Use --to DIR and --keep-days N.`);
  }
  return { folder, keepDays };
}

const megabytes = (bytes: number) => (bytes < 1024 * 1024 ? `${(bytes / 1024).toFixed(1)} KiB` : `${(bytes / 1024 / 1024).toFixed(1)} MiB`);

async function main() {
  const began = Date.now();
  const options = parseArgs(process.argv.slice(2));
  const target = databaseTarget();
  const dump = mariadbProgram("mariadb-dump", (line) => console.log(line));

  const connection = await connectTo(target.login, target.database).catch((error: Error) => {
    throw new BackupError(`Could not reach database ${target.database} on ${target.where}: ${error.message}`);
  });
  let server: string;
  try {
    const tables = await baseTables(connection, target.database);
    if (!tables.some((t) => t.name === MIGRATIONS_TABLE)) {
      throw new BackupError(`Database ${target.database} on ${target.where} has no Cloche tables (no ${MIGRATIONS_TABLE}); nothing to back up.`);
    }
    // One transaction gives a consistent snapshot only of InnoDB tables.
    const other = tables.filter((t) => t.engine !== "InnoDB");
    if (other.length) {
      throw new BackupError(
        `Not backing up: ${other.map((t) => `${t.name} (${t.engine})`).join(", ")} ${other.length === 1 ? "is not an InnoDB table" : "are not InnoDB tables"}, so one transaction would not give a consistent copy.`,
      );
    }
    const [[version]] = (await connection.query("SELECT VERSION() AS v")) as unknown as [{ v: string }[]];
    server = version!.v;
  } finally {
    await connection.end();
  }

  mkdirSync(options.folder, { recursive: true });
  const madeAt = new Date();
  const finalPath = path.join(options.folder, backupFileName(target.database, madeAt));
  // Not the final name until complete, so a half-written dump never looks like a backup.
  const partialPath = path.join(options.folder, `.${path.basename(finalPath)}.partial-${process.pid}`);
  const scanner = new DumpScanner();
  const header = backupHeader({ database: target.database, madeAt, server });
  scanner.push(header);

  console.log(`[backup] dumping ${target.database} on ${target.where}…`);
  try {
    await runClient(
      dump,
      target.login,
      [
        "--single-transaction",
        "--quick",
        // The app's user has rights on its own database only; tablespaces need PROCESS.
        "--no-tablespaces",
        "--routines",
        "--triggers",
        "--events",
        "--hex-blob",
        "--default-character-set=utf8mb4",
        target.database,
      ],
      {
        onOutput: (stdout) =>
          pipeline(
            async function* () {
              yield Buffer.from(header);
              for await (const chunk of stdout) {
                scanner.push(chunk as Buffer);
                yield chunk as Buffer;
              }
            },
            createGzip(),
            createWriteStream(partialPath, { mode: 0o600 }),
          ),
      },
    );
    const summary = scanner.finish();
    const fd = openSync(partialPath, "r");
    fsyncSync(fd);
    closeSync(fd);
    renameSync(partialPath, finalPath);
    const dir = openSync(options.folder, "r");
    fsyncSync(dir);
    closeSync(dir);

    const main = new Map(MAIN_TABLES.filter((t) => summary.rows.has(t)).map((t) => [t, summary.rows.get(t)!]));
    const total = [...summary.rows.values()].reduce((a, b) => a + b, 0);
    console.log(
      [
        `[backup] wrote ${finalPath}`,
        `  size ${megabytes(statSync(finalPath).size)}; ${summary.tables.length} tables, ${total.toLocaleString("en")} rows in all; took ${((Date.now() - began) / 1000).toFixed(1)} s`,
        "  rows in the main tables:",
        formatCounts(main),
      ].join("\n"),
    );
  } catch (error) {
    rmSync(partialPath, { force: true });
    if (error instanceof DumpFormatError) throw new BackupError(`The dump from mariadb-dump is not complete: ${error.message}. No backup was written.`);
    throw error;
  }

  if (options.keepDays !== null) {
    const removed = pruneBackups(options.folder, target.database, options.keepDays, madeAt);
    console.log(
      removed.length
        ? `[backup] removed ${removed.length} backup${removed.length === 1 ? "" : "s"} older than ${options.keepDays} days: ${removed.join(", ")}`
        : `[backup] no backups older than ${options.keepDays} days to remove`,
    );
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof BackupError ? `[backup] ${error.message}` : error);
  process.exit(1);
});
