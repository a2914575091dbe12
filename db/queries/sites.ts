import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { memberships, sites, user } from "@/db/schema";
import type { NewSiteInput } from "@/lib/schemas/account";
import type { SiteChange } from "@/lib/schemas/site";
import type { Role } from "@/lib/permissions";
import type { DegreeDayMethod } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import { recordAudit } from "./audit";

export type SiteWithRole = {
  id: string;
  slug: string;
  name: string;
  timeZone: string;
  currency: string;
  mainsVoltage: number;
  continuousLoadPercent: number;
  degreeDayMethod: DegreeDayMethod;
  role: Role;
};

const siteColumns = {
  id: sites.id,
  slug: sites.slug,
  name: sites.name,
  timeZone: sites.timeZone,
  currency: sites.currency,
  mainsVoltage: sites.mainsVoltage,
  continuousLoadPercent: sites.continuousLoadPercent,
  degreeDayMethod: sites.degreeDayMethod,
  role: memberships.role,
};

export async function getSitesForUser({ userId }: { userId: string }): Promise<SiteWithRole[]> {
  return getDb()
    .select(siteColumns)
    .from(memberships)
    .innerJoin(sites, eq(sites.id, memberships.siteId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(sites.name));
}

/** The site with the user's role in it, or null when they are not a member (or it does not exist). */
export async function getSiteForMember({
  userId,
  siteId,
  slug,
}: {
  userId: string;
  siteId?: string;
  slug?: string;
}): Promise<SiteWithRole | null> {
  const match = siteId ? eq(sites.id, siteId) : slug ? eq(sites.slug, slug) : undefined;
  if (!match) return null;
  const [row] = await getDb()
    .select(siteColumns)
    .from(memberships)
    .innerJoin(sites, eq(sites.id, memberships.siteId))
    .where(and(eq(memberships.userId, userId), match))
    .limit(1);
  return row ?? null;
}

export function slugify(name: string) {
  const base = name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 48);
  return base || "site";
}

export function isDuplicateKey(error: unknown) {
  const cause = (error as { cause?: { code?: string } })?.cause ?? error;
  return (cause as { code?: string })?.code === "ER_DUP_ENTRY";
}

/** A new site with `userId` as its owner; the slug gets a suffix when the name is taken. */
export async function createSiteForOwner({ userId, site }: { userId: string; site: NewSiteInput }) {
  const db = getDb();
  const base = slugify(site.siteName);
  for (let attempt = 0; attempt < 20; attempt++) {
    const slug = attempt === 0 ? base : `${base}-${attempt < 5 ? attempt + 1 : randomUUID().slice(0, 6)}`;
    const id = randomUUID();
    try {
      await db.transaction(async (tx) => {
        await tx.insert(sites).values({ id, slug, name: site.siteName, timeZone: site.timeZone, currency: site.currency });
        await tx.insert(memberships).values({ siteId: id, userId, role: "owner" });
        await recordAudit(tx, {
          siteId: id,
          userId,
          action: "site.create",
          entityType: "site",
          entityId: id,
          after: { slug, ...site },
        });
      });
      return { id, slug };
    } catch (error) {
      if (!isDuplicateKey(error)) throw error;
    }
  }
  throw new AppError("conflict", "Could not find a free address for this site; try another name.");
}

/** The site's members, by name, with the day each joined (`since`). */
export async function getMembersOfSite({ siteId }: { siteId: string }) {
  return getDb()
    .select({ id: memberships.id, userId: user.id, name: user.name, email: user.email, role: memberships.role, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .where(eq(memberships.siteId, siteId))
    .orderBy(asc(user.name));
}

export async function updateSite({ site, userId, change }: { site: SiteWithRole; userId: string; change: SiteChange }) {
  const { role: _role, ...before } = site;
  await getDb().transaction(async (tx) => {
    await tx.update(sites).set(change).where(eq(sites.id, site.id));
    await recordAudit(tx, { siteId: site.id, userId, action: "site.update", entityType: "site", entityId: site.id, before, after: change });
  });
  return (await getSiteForMember({ userId, siteId: site.id }))!;
}
