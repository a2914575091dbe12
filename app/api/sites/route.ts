import { createSiteForOwner, getSitesForUser } from "@/db/queries/sites";
import { parseJsonBody, route } from "@/lib/server/http";
import { newSiteSchema } from "@/lib/schemas/account";
import { requireUser } from "@/lib/server/session";

/** The sites the signed-in person belongs to, with their role in each. */
export const GET = route(async (request) => {
  const user = await requireUser(request.headers);
  return Response.json({ sites: await getSitesForUser({ userId: user.id }) });
});

/** A new site, owned by the signed-in person. */
export const POST = route(async (request) => {
  const input = await parseJsonBody(request, newSiteSchema);
  const user = await requireUser(request.headers);
  const site = await createSiteForOwner({ userId: user.id, site: input });
  return Response.json({ site }, { status: 201 });
});
