import "server-only";
import { getSiteForMember, type SiteWithRole } from "@/db/queries/sites";
import { getAuth } from "./auth";
import { AppError } from "@/lib/errors";
import { assertCan, type Action } from "@/lib/permissions";

export type SessionUser = { id: string; name: string; email: string };

export async function getSessionUser(headers: Headers): Promise<SessionUser | null> {
  const session = await getAuth().api.getSession({ headers });
  if (!session) return null;
  const { id, name, email } = session.user;
  return { id, name, email };
}

/** 401 when nobody is signed in. */
export async function requireUser(headers: Headers): Promise<SessionUser> {
  const user = await getSessionUser(headers);
  if (!user) throw new AppError("unauthenticated", "Sign in to continue.");
  return user;
}

/**
 * The site and the user's role in it. A site the user is not a member of is a 404,
 * exactly like one that does not exist, so ids of other sites reveal nothing.
 */
export async function requireMemberSite(user: SessionUser, siteId: string): Promise<SiteWithRole> {
  const site = await getSiteForMember({ userId: user.id, siteId });
  if (!site) throw new AppError("not_found", "No such site.");
  return site;
}

/** 403 unless the user's role in the site allows the action. */
export function requirePermission(site: SiteWithRole, action: Action): void {
  assertCan(site.role, action);
}
