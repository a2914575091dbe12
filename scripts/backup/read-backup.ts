// Reads a backup file through once before anything is changed: it must be gzip, start
// with Cloche's header, decompress to its end (the gzip checksum included) and end with
// mariadb-dump's "-- Dump completed" line.
import { createReadStream, openSync, readSync, closeSync, statSync } from "node:fs";
import { pipeline } from "node:stream/promises";
import { createGunzip } from "node:zlib";
import { BackupError } from "./database";
import { DumpFormatError, DumpScanner, type DumpSummary } from "./dump-format";

export type BackupFile = DumpSummary & { file: string; bytes: number };

function startsWithGzipMagic(file: string) {
  const fd = openSync(file, "r");
  try {
    const head = Buffer.alloc(2);
    return readSync(fd, head, 0, 2, 0) === 2 && head[0] === 0x1f && head[1] === 0x8b;
  } finally {
    closeSync(fd);
  }
}

export async function readBackup(file: string): Promise<BackupFile> {
  let bytes: number;
  try {
    const stat = statSync(file);
    if (!stat.isFile()) throw new BackupError(`${file} is not a file.`);
    bytes = stat.size;
  } catch (error) {
    if (error instanceof BackupError) throw error;
    throw new BackupError(`There is no file ${file}.`);
  }
  if (!startsWithGzipMagic(file)) {
    throw new BackupError(`${file} is not a Cloche backup: it is not gzip-compressed (backups are the .sql.gz files \`npm run backup\` writes).`);
  }
  const scanner = new DumpScanner();
  let formatError: DumpFormatError | undefined;
  try {
    await pipeline(createReadStream(file), createGunzip(), async (chunks: AsyncIterable<Buffer>) => {
      for await (const chunk of chunks) {
        try {
          scanner.push(chunk);
        } catch (error) {
          // Leaving the loop aborts the pipeline, which then reports the abort, not this.
          formatError = error as DumpFormatError;
          throw error;
        }
      }
    });
    return { ...scanner.finish(), file, bytes };
  } catch (caught) {
    const error = formatError ?? caught;
    if (error instanceof DumpFormatError) throw new BackupError(`${file} cannot be restored: ${error.message}.`);
    const code = (error as NodeJS.ErrnoException).code;
    if (code?.startsWith("Z_")) {
      throw new BackupError(`${file} cannot be restored: it is cut off or damaged (gzip says: ${(error as Error).message}).`);
    }
    throw error;
  }
}
