// Route cases of a plug's weekly plan and its preview.
import type { RouteCase } from "./case";
import * as scheduleRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/schedule/route";
import * as previewRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/schedule/preview/route";

/** A plan the demo's glasshouse heater may take (its house: frost limit 2 °C, cut-out 35 °C by default). */
export const demoPlan = {
  name: "Winter days",
  windows: [{ days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], start: "06:00", durationMin: 900, mode: "band", lowC: 8, highC: 10 }],
  outsideWindows: "frost",
  frostLowC: 3,
  frostHighC: 5,
  validFrom: null,
  validUntil: null,
  skipDays: [],
};

const file = "app/api/sites/[siteId]/plugs/[plugId]/schedule/route.ts";
const previewFile = "app/api/sites/[siteId]/plugs/[plugId]/schedule/preview/route.ts";
const path = (i: { siteId: string; plugId: string }) => `/api/sites/${i.siteId}/plugs/${i.plugId}/schedule`;
const params = (i: { siteId: string; plugId: string }) => ({ siteId: i.siteId, plugId: i.plugId });

export const cases: RouteCase[] = [
  { file, method: "GET", handler: scheduleRoute.GET, path, params, siteScoped: true, write: false },
  { file, method: "PUT", handler: scheduleRoute.PUT, path, params, body: demoPlan, siteScoped: true, write: true },
  { file: previewFile, method: "GET", handler: previewRoute.GET, path: (i) => `${path(i)}/preview?hours=24`, params, siteScoped: true, write: false },
  { file: previewFile, method: "POST", handler: previewRoute.POST, path: (i) => `${path(i)}/preview`, params, body: { hours: 24, plan: demoPlan }, siteScoped: true, write: false },
];
