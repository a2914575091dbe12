import "server-only";
import type { Database } from "@/db/client";
import { auditLog } from "@/db/schema";

type Writer = Pick<Database, "insert">;

export type AuditEntry = {
  siteId: string;
  userId: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
};

/** Records a configuration change; call it inside the change's own transaction. */
export async function recordAudit(db: Writer, entry: AuditEntry) {
  await db.insert(auditLog).values({
    siteId: entry.siteId,
    userId: entry.userId,
    at: new Date(),
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}
