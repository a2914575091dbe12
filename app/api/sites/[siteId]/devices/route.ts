import { z } from "zod";
import { getDevicesBySite } from "@/db/queries/devices";
import { siteParams } from "@/lib/schemas/site";
import { parseWith } from "@/lib/server/http";
import { siteRoute } from "@/lib/server/site-route";

const retiredQuery = z.enum(["0", "1"], { error: "retired must be 0 or 1" }).nullable();

/** Every plug and sensor of the site with presence and last seen; `?retired=1` adds the retired ones. */
export const GET = siteRoute({
  params: siteParams,
  action: "site.view",
  handle: async ({ site, request }) => {
    const includeRetired = parseWith(retiredQuery, new URL(request.url).searchParams.get("retired")) === "1";
    return Response.json(await getDevicesBySite({ siteId: site.id, includeRetired }), { headers: { "cache-control": "no-store" } });
  },
});
