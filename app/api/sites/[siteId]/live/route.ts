import { getSiteLive } from "@/db/queries/live";
import { parseWith, route } from "@/lib/server/http";
import { siteParams } from "@/lib/schemas/site";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

export const dynamic = "force-dynamic";

/** Latest readings, 24 h ranges, plug states and open alerts; the overview polls this. */
export const GET = route<{ siteId: string }>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "site.view");
  return Response.json(await getSiteLive({ siteId }));
});
