import { createHouse, getHouseOverviewsBySite } from "@/db/queries/houses";
import { siteRoute } from "@/lib/server/site-route";
import { houseSchema } from "@/lib/schemas/house";
import { siteParams } from "@/lib/schemas/site";

export const GET = siteRoute({
  params: siteParams,
  action: "site.view",
  handle: async ({ site }) => Response.json({ houses: await getHouseOverviewsBySite({ siteId: site.id }) }),
});

export const POST = siteRoute({
  params: siteParams,
  body: houseSchema,
  action: "houses.manage",
  handle: async ({ site, user, body }) => {
    const house = await createHouse({ siteId: site.id, userId: user.id, input: body });
    return Response.json({ house }, { status: 201 });
  },
  wakes: { reason: "house" },
});
