import { getMembersOfSite } from "@/db/queries/sites";
import { parseWith, route } from "@/lib/server/http";
import { siteParams } from "@/lib/schemas/site";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

export const GET = route<{ siteId: string }>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "members.view");
  return Response.json({ members: await getMembersOfSite({ siteId }) });
});
