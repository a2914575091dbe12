// Writes one backup: checks the database can be dumped consistently, runs mariadb-dump
// in one transaction, gzips its output under a temporary name and renames it when the
// dump is known complete.
import { closeSync, createWriteStream, fsyncSync, mkdirSync, openSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import { BackupError, MIGRATIONS_TABLE, baseTables, connectTo, runClient, type Target } from "./database";
import { DumpFormatError, DumpScanner, backupHeader, type DumpSummary } from "./dump-format";
import { backupFileName } from "./files";

export type WrittenBackup = DumpSummary & { file: string; bytes: number };

/** The server's version; refuses a database that is not Cloche's or not all InnoDB. */
async function checkDumpable(target: Target): Promise<string> {
  const connection = await connectTo(target.login, target.database).catch((error: Error) => {
    throw new BackupError(`Could not reach database ${target.database} on ${target.where}: ${error.message}`);
  });
  try {
    const tables = await baseTables(connection, target.database);
    if (!tables.some((t) => t.name === MIGRATIONS_TABLE)) {
      throw new BackupError(`Database ${target.database} on ${target.where} has no Cloche tables (no ${MIGRATIONS_TABLE}); nothing to back up.`);
    }
    // One transaction gives a consistent snapshot only of InnoDB tables.
    const other = tables.filter((t) => t.engine !== "InnoDB");
    if (other.length) {
      throw new BackupError(
        `Not backing up ${target.database}: ${other.map((t) => `${t.name} (${t.engine})`).join(", ")} ${other.length === 1 ? "is not an InnoDB table" : "are not InnoDB tables"}, so one transaction would not give a consistent copy.`,
      );
    }
    const [rows] = await connection.query("SELECT VERSION() AS v");
    return (rows as { v: string }[])[0]!.v;
  } finally {
    await connection.end();
  }
}

function fsyncPath(file: string) {
  const fd = openSync(file, "r");
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

export async function writeBackup(target: Target, folder: string, dumpProgram: string): Promise<WrittenBackup> {
  const server = await checkDumpable(target);
  mkdirSync(folder, { recursive: true });
  const madeAt = new Date();
  const finalPath = path.join(folder, backupFileName(target.database, madeAt));
  // Not the final name until complete, so a half-written dump never looks like a backup.
  const partialPath = path.join(folder, `.${path.basename(finalPath)}.partial-${process.pid}`);
  const header = backupHeader({ database: target.database, madeAt, server });
  const scanner = new DumpScanner();
  scanner.push(header);
  const args = [
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
  ];
  try {
    await runClient(dumpProgram, target.login, args, {
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
    });
    const summary = scanner.finish();
    fsyncPath(partialPath);
    renameSync(partialPath, finalPath);
    fsyncPath(folder);
    return { ...summary, file: finalPath, bytes: statSync(finalPath).size };
  } catch (error) {
    rmSync(partialPath, { force: true });
    if (error instanceof DumpFormatError) throw new BackupError(`The dump from mariadb-dump is not complete: ${error.message}. No backup was written.`);
    throw error;
  }
}
