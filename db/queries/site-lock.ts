import "server-only";
import { and, eq } from "drizzle-orm";
import type { Database } from "@/db/client";
import { memberships, sites } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { can, type Action, type Role } from "@/lib/permissions";

/** A transaction of the web app's database. */
type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

/**
 * Takes the site's row lock for a change to who belongs to it, and checks again, under
 * the lock, that the person acting may still do it: two owners changing each other at
 * the same moment are put one after the other, and the second sees the first's change.
 */
export async function lockSiteForMembers(tx: Tx, { siteId, actorId, action }: { siteId: string; actorId: string; action: Action }) {
  const [site] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.id, siteId)).for("update");
  if (!site) throw new AppError("not_found", "No such site.");
  const [actor] = await tx
    .select({ role: memberships.role })
    .from(memberships)
    .where(eqMember(siteId, actorId))
    .limit(1)
    .for("update");
  if (!actor) throw new AppError("not_found", "No such site.");
  if (!can(actor.role, action)) {
    throw new AppError("forbidden", `Your role (${actor.role}) does not allow this (${action}).`);
  }
  return { actorRole: actor.role as Role };
}

export function eqMember(siteId: string, userId: string) {
  return and(eq(memberships.siteId, siteId), eq(memberships.userId, userId));
}

export type { Tx };
