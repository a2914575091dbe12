// Route cases of the switch history: its pages and its CSV export.
import type { RouteCase } from "./case";
import * as switchesRoute from "@/app/api/sites/[siteId]/switches/route";
import * as exportRoute from "@/app/api/sites/[siteId]/switches/export/route";

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/switches/route.ts", method: "GET", handler: switchesRoute.GET, path: (i) => `/api/sites/${i.siteId}/switches`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/switches/export/route.ts", method: "GET", handler: exportRoute.GET, path: (i) => `/api/sites/${i.siteId}/switches/export`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
];
