// Route cases of the houses overview's live parts: a house's chart.
import type { RouteCase } from "./case";
import * as chartRoute from "@/app/api/sites/[siteId]/houses/[houseId]/chart/route";

export const cases: RouteCase[] = [
  {
    file: "app/api/sites/[siteId]/houses/[houseId]/chart/route.ts",
    method: "GET",
    handler: chartRoute.GET,
    path: (i) => `/api/sites/${i.siteId}/houses/${i.houseId}/chart?range=24h`,
    params: (i) => ({ siteId: i.siteId, houseId: i.houseId }),
    siteScoped: true,
    write: false,
  },
];
