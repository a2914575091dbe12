import { deleteHouse, requireHouse, updateHouse } from "@/db/queries/houses";
import { parseJsonBody, parseWith, route } from "@/lib/server/http";
import { houseChangeSchema, houseParams } from "@/lib/schemas/house";
import { requireMemberSite, requirePermission, requireUser } from "@/lib/server/session";

type Params = { siteId: string; houseId: string };

export const GET = route<Params>(async (request, params) => {
  const { siteId, houseId } = parseWith(houseParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  const house = await requireHouse({ siteId: site.id, houseId });
  requirePermission(site, "site.view");
  return Response.json({ house });
});

export const PATCH = route<Params>(async (request, params) => {
  const { siteId, houseId } = parseWith(houseParams, params);
  const change = await parseJsonBody(request, houseChangeSchema);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  const house = await requireHouse({ siteId: site.id, houseId });
  requirePermission(site, "houses.manage");
  return Response.json({ house: await updateHouse({ house, userId: user.id, change }) });
});

export const DELETE = route<Params>(async (request, params) => {
  const { siteId, houseId } = parseWith(houseParams, params);
  const user = await requireUser(request.headers);
  const site = await requireMemberSite(user, siteId);
  const house = await requireHouse({ siteId: site.id, houseId });
  requirePermission(site, "houses.manage");
  await deleteHouse({ house, userId: user.id });
  return new Response(null, { status: 204 });
});
