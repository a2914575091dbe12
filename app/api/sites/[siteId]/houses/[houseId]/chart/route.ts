import { requireHouse } from "@/db/queries/houses";
import { getHouseChart } from "@/db/queries/house-chart";
import { chartQuery } from "@/lib/schemas/chart";
import { houseParams } from "@/lib/schemas/house";
import { siteRoute } from "@/lib/server/site-route";

export const dynamic = "force-dynamic";

/** Temperature and humidity of a house over `?range=24h|7d`, with the band and the heaters' on-periods. */
export const GET = siteRoute({
  params: houseParams,
  query: chartQuery,
  action: "site.view",
  load: ({ site, params }) => requireHouse({ siteId: site.id, houseId: params.houseId }),
  handle: async ({ site, params, query }) =>
    Response.json(await getHouseChart({ siteId: site.id, houseId: params.houseId, range: query.range }), {
      headers: { "cache-control": "private, no-store" },
    }),
});
