import { updateSite } from "@/db/queries/sites";
import { parseJsonBody, parseWith, route } from "@/lib/server/http";
import { siteChangeSchema, siteParams } from "@/lib/schemas/site";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

type Params = { siteId: string };

export const GET = route<Params>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "site.view");
  return Response.json({ site });
});

export const PATCH = route<Params>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const change = await parseJsonBody(request, siteChangeSchema);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "site.edit");
  return Response.json({ site: await updateSite({ site, userId: user.id, change }) });
});
