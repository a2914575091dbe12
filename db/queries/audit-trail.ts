import "server-only";
import { and, desc, eq, gte, lt, or, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, user } from "@/db/schema";
import { decodeAuditCursor, encodeAuditCursor, localDayRange } from "@/lib/audit";
import type { AuditFilter } from "@/lib/schemas/audit";

export type AuditEntry = {
  id: number;
  at: Date;
  userId: string | null;
  userName: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
};

/**
 * One page of the site's audit trail, newest first, after `cursor` (keyset on (at, id),
 * so a page costs the same however deep it is). The site's indexes lead with
 * (site, at), (site, user, at) or (site, entity_type, at).
 */
export async function getAuditPage({ siteId, timeZone, filter }: { siteId: string; timeZone: string; filter: AuditFilter }) {
  const { start, end } = localDayRange(filter, timeZone);
  const cursor = filter.cursor ? decodeAuditCursor(filter.cursor) : null;
  const where: (SQL | undefined)[] = [
    eq(auditLog.siteId, siteId),
    filter.userId ? eq(auditLog.userId, filter.userId) : undefined,
    filter.entityType ? eq(auditLog.entityType, filter.entityType) : undefined,
    filter.action ? eq(auditLog.action, filter.action) : undefined,
    start ? gte(auditLog.at, start) : undefined,
    end ? lt(auditLog.at, end) : undefined,
    cursor ? or(lt(auditLog.at, cursor.at), and(eq(auditLog.at, cursor.at), lt(auditLog.id, cursor.id))) : undefined,
  ];
  const rows: AuditEntry[] = await getDb()
    .select({
      id: auditLog.id,
      at: auditLog.at,
      userId: auditLog.userId,
      userName: user.name,
      action: auditLog.action,
      entityType: auditLog.entityType,
      entityId: auditLog.entityId,
      before: auditLog.before,
      after: auditLog.after,
    })
    .from(auditLog)
    .leftJoin(user, eq(user.id, auditLog.userId))
    .where(and(...where))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(filter.limit + 1);
  const entries = rows.slice(0, filter.limit);
  const last = entries.at(-1);
  return { entries, nextCursor: rows.length > filter.limit && last ? encodeAuditCursor(last) : null };
}

/** What the filters offer: everyone who changed something, and the kinds and actions recorded. */
export async function getAuditFilterChoices({ siteId }: { siteId: string }) {
  const db = getDb();
  const [people, kinds, actions] = await Promise.all([
    db.selectDistinct({ id: user.id, name: user.name }).from(auditLog).innerJoin(user, eq(user.id, auditLog.userId)).where(eq(auditLog.siteId, siteId)),
    db.selectDistinct({ entityType: auditLog.entityType }).from(auditLog).where(eq(auditLog.siteId, siteId)),
    db.selectDistinct({ action: auditLog.action }).from(auditLog).where(eq(auditLog.siteId, siteId)),
  ]);
  return {
    people: people.sort((a, b) => a.name.localeCompare(b.name)),
    entityTypes: kinds.map((k) => k.entityType).sort(),
    actions: actions.map((a) => a.action).sort(),
  };
}
