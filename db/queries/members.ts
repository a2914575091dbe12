import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, user } from "@/db/schema";
import { AppError } from "@/lib/errors";
import type { Role } from "@/lib/permissions";
import { recordAudit } from "./audit";
import { eqMember, lockSiteForMembers, type Tx } from "./site-lock";

export type Member = { userId: string; name: string; email: string; role: Role; since: Date };

const memberColumns = { userId: user.id, name: user.name, email: user.email, role: memberships.role, since: memberships.createdAt };

async function findMember(db: Pick<Tx, "select">, { siteId, userId }: { siteId: string; userId: string }): Promise<Member | null> {
  const [row] = await db.select(memberColumns).from(memberships).innerJoin(user, eq(user.id, memberships.userId)).where(eqMember(siteId, userId)).limit(1);
  return row ?? null;
}

/** The member of the site, or a 404 (someone in another site is no member here). */
export async function requireMember({ siteId, userId }: { siteId: string; userId: string }): Promise<Member> {
  const member = await findMember(getDb(), { siteId, userId });
  if (!member) throw new AppError("not_found", "No such member of this site.");
  return member;
}

async function ownerCount(tx: Tx, siteId: string): Promise<number> {
  const [row] = await tx
    .select({ n: sql<number>`COUNT(*)`.mapWith(Number) })
    .from(memberships)
    .where(and(eq(memberships.siteId, siteId), eq(memberships.role, "owner")))
    // A locking read sees the latest committed rows, not the transaction's snapshot (MariaDB has no FOR SHARE).
    .for("update");
  return row?.n ?? 0;
}

const LAST_OWNER = "A site needs at least one owner: make someone else an owner first.";

/**
 * Under the site's lock (lockSiteForMembers) the member is read again, so the last
 * owner is counted as things are when the change is made, not as they were when the
 * request came in.
 */
async function lockedMember(tx: Tx, siteId: string, actorId: string, userId: string): Promise<Member> {
  await lockSiteForMembers(tx, { siteId, actorId, action: "members.manage" });
  const member = await findMember(tx, { siteId, userId });
  if (!member) throw new AppError("not_found", "No such member of this site.");
  return member;
}

const auditView = (m: Member) => ({ name: m.name, email: m.email, role: m.role });

export async function changeMemberRole({ siteId, actorId, userId, role }: { siteId: string; actorId: string; userId: string; role: Role }): Promise<Member> {
  return getDb().transaction(async (tx) => {
    const member = await lockedMember(tx, siteId, actorId, userId);
    if (member.role === role) return member;
    if (member.role === "owner" && (await ownerCount(tx, siteId)) <= 1) {
      throw new AppError("conflict", `${member.name} is the site's only owner. ${LAST_OWNER}`, { role: "the last owner stays an owner" });
    }
    await tx.update(memberships).set({ role }).where(eqMember(siteId, userId));
    const after = { ...member, role };
    await recordAudit(tx, { siteId, userId: actorId, action: "member.role", entityType: "member", entityId: userId, before: auditView(member), after: auditView(after) });
    return after;
  });
}

export async function removeMember({ siteId, actorId, userId }: { siteId: string; actorId: string; userId: string }): Promise<void> {
  await getDb().transaction(async (tx) => {
    const member = await lockedMember(tx, siteId, actorId, userId);
    if (member.role === "owner" && (await ownerCount(tx, siteId)) <= 1) {
      throw new AppError("conflict", `${member.name} is the site's only owner and cannot be removed. ${LAST_OWNER}`);
    }
    await tx.delete(memberships).where(eqMember(siteId, userId));
    await recordAudit(tx, { siteId, userId: actorId, action: "member.remove", entityType: "member", entityId: userId, before: auditView(member) });
  });
}
