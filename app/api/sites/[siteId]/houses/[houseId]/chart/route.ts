import { requireHouse } from "@/db/queries/houses";
import { getHouseChart } from "@/db/queries/house-chart";
import { chartParams } from "@/lib/schemas/chart";
import { siteRoute } from "@/lib/server/site-route";

export const dynamic = "force-dynamic";

const chart = siteRoute({
  params: chartParams,
  action: "site.view",
  load: ({ site, params }) => requireHouse({ siteId: site.id, houseId: params.houseId }),
  handle: async ({ site, params }) =>
    Response.json(await getHouseChart({ siteId: site.id, houseId: params.houseId, range: params.range }), {
      headers: { "cache-control": "private, no-store" },
    }),
});

type Segments = { siteId: string; houseId: string };

/**
 * Temperature and humidity of a house over `?range=24h|7d` with the band and the
 * heaters' on-periods. The query's `range` is parsed with the route's segments, so a
 * bad range is a 400 before the session is looked at, like every other input.
 */
export function GET(request: Request, context: { params: Promise<Segments> }) {
  const range = new URL(request.url).searchParams.get("range") ?? undefined;
  // An absent range is left undefined for the schema to default (24 h).
  return chart(request, { params: context.params.then((segments) => ({ ...segments, range: range as string })) });
}
