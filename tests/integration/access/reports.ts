// Route cases of the energy report and its exports.
import type { RouteCase } from "./case";
import * as energyRoute from "@/app/api/sites/[siteId]/reports/energy/route";
import * as csvRoute from "@/app/api/sites/[siteId]/reports/energy/csv/route";
import * as pdfRoute from "@/app/api/sites/[siteId]/reports/energy/pdf/route";

const range = "from=2026-11-01&to=2026-11-30";

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/reports/energy/route.ts", method: "GET", handler: energyRoute.GET, path: (i) => `/api/sites/${i.siteId}/reports/energy?${range}`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/reports/energy/csv/route.ts", method: "GET", handler: csvRoute.GET, path: (i) => `/api/sites/${i.siteId}/reports/energy/csv?${range}`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/reports/energy/pdf/route.ts", method: "GET", handler: pdfRoute.GET, path: (i) => `/api/sites/${i.siteId}/reports/energy/pdf?${range}`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
];
