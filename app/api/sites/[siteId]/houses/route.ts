import { createHouse, getHouseOverviewsBySite } from "@/db/queries/houses";
import { parseJsonBody, parseWith, route } from "@/lib/server/http";
import { houseSchema } from "@/lib/schemas/house";
import { siteParams } from "@/lib/schemas/site";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

type Params = { siteId: string };

export const GET = route<Params>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "site.view");
  return Response.json({ houses: await getHouseOverviewsBySite({ siteId }) });
});

export const POST = route<Params>(async (request, params) => {
  const { siteId } = parseWith(siteParams, params);
  const input = await parseJsonBody(request, houseSchema);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  requirePermission(site, "houses.manage");
  const house = await createHouse({ siteId, userId: user.id, input });
  return Response.json({ house }, { status: 201 });
});
