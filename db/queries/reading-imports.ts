import "server-only";
import { and, asc, count, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { insertMany } from "@/db/bulk";
import { houses, readingImports, readingMinutes, sensors, user } from "@/db/schema";
import { AppError } from "@/lib/errors";
import type { MinuteColumns } from "@/lib/readings-import/parse";
import type { ReadingImportOptions } from "@/lib/schemas/reading-import";
import { recordAudit } from "./audit";

/** Minutes per statement, when counting those already stored and when inserting. */
export const IMPORT_BATCH = 2_000;

export type ImportSensor = { id: string; name: string; placement: "inside" | "outside"; houseId: string; houseName: string; retiredAt: Date | null };

/** A sensor of the site that readings may be imported for (retired ones too: their history is theirs); 404 otherwise. */
export async function getImportSensor({ siteId, sensorId }: { siteId: string; sensorId: string }): Promise<ImportSensor> {
  const [row] = await getDb()
    .select({ id: sensors.id, name: sensors.name, placement: sensors.placement, houseId: sensors.houseId, houseName: houses.name, retiredAt: sensors.retiredAt })
    .from(sensors)
    .innerJoin(houses, and(eq(houses.id, sensors.houseId), eq(houses.siteId, siteId)))
    .where(and(eq(sensors.siteId, siteId), eq(sensors.id, sensorId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such sensor in this site.");
  return row;
}

/** The site's working sensors by house and name, for choosing where readings go. */
export async function getImportSensorsBySite({ siteId }: { siteId: string }): Promise<ImportSensor[]> {
  return getDb()
    .select({ id: sensors.id, name: sensors.name, placement: sensors.placement, houseId: sensors.houseId, houseName: houses.name, retiredAt: sensors.retiredAt })
    .from(sensors)
    .innerJoin(houses, and(eq(houses.id, sensors.houseId), eq(houses.siteId, siteId)))
    .where(eq(sensors.siteId, siteId))
    .orderBy(asc(houses.name), asc(sensors.name));
}

type Reader = Pick<ReturnType<typeof getDb>, "select">;

/** How many of these minutes the sensor already has (live or imported), one statement per batch. */
async function storedAmong(db: Reader, sensorId: string, minutes: number[], from: number, to: number): Promise<number> {
  if (to <= from) return 0;
  const [row] = await db
    .select({ n: count() })
    .from(readingMinutes)
    .where(and(eq(readingMinutes.sensorId, sensorId), inArray(readingMinutes.minute, minutes.slice(from, to).map((m) => new Date(m)))));
  return Number(row?.n ?? 0);
}

export type Progress = (done: number, total: number) => void | Promise<void>;

export async function countStoredMinutes({ sensorId, minutes, onProgress }: { sensorId: string; minutes: number[]; onProgress?: Progress }): Promise<number> {
  let stored = 0;
  for (let i = 0; i < minutes.length; i += IMPORT_BATCH) {
    stored += await storedAmong(getDb(), sensorId, minutes, i, i + IMPORT_BATCH);
    await onProgress?.(Math.min(i + IMPORT_BATCH, minutes.length), minutes.length);
  }
  return stored;
}

export type ImportRecord = {
  id: number;
  fileName: string;
  rowsRead: number;
  minutesAdded: number;
  minutesAlreadyThere: number;
  firstAt: Date | null;
  lastAt: Date | null;
  importedAt: Date;
  importedBy: string | null;
  note: string | null;
};

/**
 * Writes the file's per-minute summaries for the sensor: a minute the sensor already
 * has (heard live or imported before) is left as it is, so the same file imported
 * again adds nothing and live readings are never overwritten. The summaries, the
 * import's row and its audit entry go in one transaction.
 */
export async function importReadingMinutes({
  siteId,
  sensorId,
  userId,
  fileName,
  fileSha256,
  options,
  rowsRead,
  minutes,
  firstAt,
  lastAt,
  note,
  onProgress,
}: {
  siteId: string;
  sensorId: string;
  userId: string;
  fileName: string;
  fileSha256: string;
  options: ReadingImportOptions;
  rowsRead: number;
  minutes: MinuteColumns;
  firstAt: number | null;
  lastAt: number | null;
  note: string | null;
  onProgress?: Progress;
}): Promise<ImportRecord> {
  const total = minutes.minute.length;
  return getDb().transaction(async (tx) => {
    let already = 0;
    for (let i = 0; i < total; i += IMPORT_BATCH) {
      const end = Math.min(i + IMPORT_BATCH, total);
      already += await storedAmong(tx, sensorId, minutes.minute, i, end);
      const rows: (typeof readingMinutes.$inferInsert)[] = [];
      for (let j = i; j < end; j++) {
        rows.push({
          sensorId,
          minute: new Date(minutes.minute[j]!),
          samples: minutes.samples[j]!,
          tempMinC: minutes.min[j]!,
          tempMaxC: minutes.max[j]!,
          tempMeanC: minutes.mean[j]!,
          rhMean: minutes.rhMean[j] ?? null,
        });
      }
      await insertMany(tx, readingMinutes, rows, { keep: true });
      await onProgress?.(end, total);
    }
    const importedAt = new Date();
    const record = {
      siteId,
      sensorId,
      fileName,
      fileSha256,
      options,
      rowsRead,
      minutesAdded: total - already,
      minutesAlreadyThere: already,
      firstAt: firstAt === null ? null : new Date(firstAt),
      lastAt: lastAt === null ? null : new Date(lastAt),
      importedBy: userId,
      importedAt,
      note,
    };
    const [inserted] = await tx.insert(readingImports).values(record).$returningId();
    const id = inserted!.id;
    await recordAudit(tx, {
      siteId,
      userId,
      action: "reading_import.create",
      entityType: "reading_import",
      entityId: String(id),
      after: { sensorId, fileName, fileSha256, options, rowsRead, minutesAdded: record.minutesAdded, minutesAlreadyThere: already, firstAt: record.firstAt, lastAt: record.lastAt, note },
    });
    return { id, fileName, rowsRead, minutesAdded: record.minutesAdded, minutesAlreadyThere: already, firstAt: record.firstAt, lastAt: record.lastAt, importedAt, importedBy: userId, note };
  });
}

/** The site's latest imports, newest first, with the sensor and who imported. */
export async function getReadingImportsBySite({ siteId, limit = 20 }: { siteId: string; limit?: number }) {
  return getDb()
    .select({
      id: readingImports.id,
      sensorName: sensors.name,
      houseName: houses.name,
      fileName: readingImports.fileName,
      rowsRead: readingImports.rowsRead,
      minutesAdded: readingImports.minutesAdded,
      minutesAlreadyThere: readingImports.minutesAlreadyThere,
      firstAt: readingImports.firstAt,
      lastAt: readingImports.lastAt,
      importedAt: readingImports.importedAt,
      importedByName: user.name,
      note: readingImports.note,
    })
    .from(readingImports)
    .innerJoin(sensors, and(eq(sensors.id, readingImports.sensorId), eq(sensors.siteId, siteId)))
    .innerJoin(houses, eq(houses.id, sensors.houseId))
    .leftJoin(user, eq(user.id, readingImports.importedBy))
    .where(eq(readingImports.siteId, siteId))
    .orderBy(desc(readingImports.importedAt), desc(readingImports.id))
    .limit(limit);
}
