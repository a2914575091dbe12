import { deleteHouse, requireHouse, updateHouse } from "@/db/queries/houses";
import { siteRoute } from "@/lib/server/site-route";
import { houseChangeSchema, houseParams } from "@/lib/schemas/house";

const loadHouse = ({ site, params }: { site: { id: string }; params: { houseId: string } }) =>
  requireHouse({ siteId: site.id, houseId: params.houseId });

export const GET = siteRoute({
  params: houseParams,
  action: "site.view",
  load: loadHouse,
  handle: async ({ loaded: house }) => Response.json({ house }),
});

export const PATCH = siteRoute({
  params: houseParams,
  body: houseChangeSchema,
  action: "houses.manage",
  load: loadHouse,
  handle: async ({ loaded: house, user, body }) =>
    Response.json({ house: await updateHouse({ house, userId: user.id, change: body }) }),
  wakes: { reason: "house" },
});

export const DELETE = siteRoute({
  params: houseParams,
  action: "houses.manage",
  load: loadHouse,
  handle: async ({ loaded: house, user }) => {
    await deleteHouse({ house, userId: user.id });
    return new Response(null, { status: 204 });
  },
  wakes: { reason: "house" },
});
