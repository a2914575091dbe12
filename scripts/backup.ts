// `npm run backup`: a consistent dump of Cloche's database (mariadb-dump in one
// transaction) to a dated, gzipped file.
//
//   npm run backup                        into .data/backups (or CLOCHE_BACKUP_DIR)
//   npm run backup -- --to DIR            into DIR
//   npm run backup -- --keep-days N       then delete this database's backups older than N days
//
// Backs up DATABASE_URL, or the private database of a running `npm start`. Safe while
// Cloche runs: the dump reads one snapshot and takes no table locks.
import path from "node:path";
import { defaultBackupFolder, formatSize, pruneBackups } from "./backup/files";
import { BackupError, MAIN_TABLES, databaseTarget, formatCounts, mariadbProgram } from "./backup/database";
import { writeBackup } from "./backup/write-backup";

type Options = { folder: string; keepDays: number | null };

function parseArgs(argv: string[]): Options {
  let folder = defaultBackupFolder();
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

async function main() {
  const began = Date.now();
  const options = parseArgs(process.argv.slice(2));
  const target = databaseTarget();
  const dump = mariadbProgram("mariadb-dump", (line) => console.log(line));

  console.log(`[backup] dumping ${target.database} on ${target.where}…`);
  const written = await writeBackup(target, options.folder, dump);
  const main = new Map(MAIN_TABLES.filter((t) => written.rows.has(t)).map((t) => [t, written.rows.get(t)!]));
  const total = [...written.rows.values()].reduce((a, b) => a + b, 0);
  console.log(
    [
      `[backup] wrote ${written.file}`,
      `  size ${formatSize(written.bytes)}; ${written.tables.length} tables, ${total.toLocaleString("en")} rows in all; took ${((Date.now() - began) / 1000).toFixed(1)} s`,
      "  rows in the main tables:",
      formatCounts(main),
    ].join("\n"),
  );

  if (options.keepDays !== null) {
    const removed = pruneBackups(options.folder, target.database, options.keepDays, new Date(began));
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
