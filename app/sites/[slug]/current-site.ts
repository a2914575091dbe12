import "server-only";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { getSiteForMember, getSitesForUser } from "@/db/queries/sites";
import { getSessionUser } from "@/lib/server/session";

/**
 * The signed-in person and the site of the URL, read once per request and shared by
 * the layout and the pages under it. Signed out → sign-in; not a member → 404.
 */
export const getCurrentSite = cache(async (slug: string) => {
  const user = await getSessionUser(await headers());
  if (!user) redirect("/sign-in");
  const site = await getSiteForMember({ userId: user.id, slug });
  if (!site) notFound();
  return { user, site };
});

export const getMySites = cache(async (userId: string) => getSitesForUser({ userId }));
