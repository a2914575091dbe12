// Backup file names: `<database>-2026-12-03T22-15-00Z.sql.gz`, sortable and free of
// colons; and pruning the ones older than a number of days.
import { readdirSync, rmSync } from "node:fs";
import path from "node:path";
import { dataFolder } from "../common";

/** CLOCHE_BACKUP_DIR, or .data/backups in the project (git-ignored with the rest of .data). */
export function defaultBackupFolder() {
  return path.resolve(process.env.CLOCHE_BACKUP_DIR || path.join(dataFolder, "backups"));
}

export const formatSize = (bytes: number) =>
  bytes < 1024 * 1024 ? `${(bytes / 1024).toFixed(1)} KiB` : `${(bytes / 1024 / 1024).toFixed(1)} MiB`;

export function backupFileName(database: string, at: Date) {
  return `${database}-${at.toISOString().replace(/\.\d{3}Z$/, "Z").replaceAll(":", "-")}.sql.gz`;
}

/** When a file of `database` was made, from its name; null for any other file. */
export function backupFileTime(database: string, name: string): Date | null {
  const escaped = database.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const match = new RegExp(`^${escaped}-(\\d{4}-\\d{2}-\\d{2})T(\\d{2})-(\\d{2})-(\\d{2})Z\\.sql\\.gz$`).exec(name);
  if (!match) return null;
  const at = new Date(`${match[1]}T${match[2]}:${match[3]}:${match[4]}Z`);
  return Number.isNaN(at.getTime()) ? null : at;
}

/**
 * Deletes the backups of `database` in `folder` made more than `keepDays` days before
 * `now`, and partial files left there by a backup that was cut short as long ago.
 * Returns the names deleted. Files of other databases and other names are left alone.
 */
export function pruneBackups(folder: string, database: string, keepDays: number, now: Date): string[] {
  const cutoff = now.getTime() - keepDays * 24 * 3600 * 1000;
  const removed: string[] = [];
  for (const name of readdirSync(folder)) {
    const partial = /^\.(.+)\.partial-\d+$/.exec(name);
    const at = backupFileTime(database, partial ? partial[1]! : name);
    if (at && at.getTime() < cutoff) {
      rmSync(path.join(folder, name), { force: true });
      removed.push(name);
    }
  }
  return removed.sort();
}
