// Route cases of the site's own settings, houses, live data and device credentials.
import type { RouteCase } from "./case";
import * as sitesRoute from "@/app/api/sites/route";
import * as siteRoute from "@/app/api/sites/[siteId]/route";
import * as membersRoute from "@/app/api/sites/[siteId]/members/route";
import * as housesRoute from "@/app/api/sites/[siteId]/houses/route";
import * as houseRoute from "@/app/api/sites/[siteId]/houses/[houseId]/route";
import * as liveRoute from "@/app/api/sites/[siteId]/live/route";
import * as credentialRoute from "@/app/api/sites/[siteId]/devices/[kind]/[id]/credential/route";

export const newHouse = {
  name: "Test Lean-to",
  kind: "glasshouse",
  lengthM: 4,
  widthM: 2.5,
  eaveHeightM: 2,
  ridgeHeightM: 2.6,
  glazing: "single_glass",
};

export const cases: RouteCase[] = [
  { file: "app/api/sites/route.ts", method: "GET", handler: sitesRoute.GET, path: () => "/api/sites", params: () => ({}), siteScoped: false, write: false },
  { file: "app/api/sites/route.ts", method: "POST", handler: sitesRoute.POST, path: () => "/api/sites", params: () => ({}), body: { siteName: "Second Plot", timeZone: "Europe/Dublin", currency: "EUR" }, siteScoped: false, write: true },
  { file: "app/api/sites/[siteId]/route.ts", method: "GET", handler: siteRoute.GET, path: (i) => `/api/sites/${i.siteId}`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/route.ts", method: "PATCH", handler: siteRoute.PATCH, path: (i) => `/api/sites/${i.siteId}`, params: (i) => ({ siteId: i.siteId }), body: { name: "Renamed" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/members/route.ts", method: "GET", handler: membersRoute.GET, path: (i) => `/api/sites/${i.siteId}/members`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/houses/route.ts", method: "GET", handler: housesRoute.GET, path: (i) => `/api/sites/${i.siteId}/houses`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/houses/route.ts", method: "POST", handler: housesRoute.POST, path: (i) => `/api/sites/${i.siteId}/houses`, params: (i) => ({ siteId: i.siteId }), body: newHouse, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/houses/[houseId]/route.ts", method: "GET", handler: houseRoute.GET, path: (i) => `/api/sites/${i.siteId}/houses/${i.houseId}`, params: (i) => ({ ...i }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/houses/[houseId]/route.ts", method: "PATCH", handler: houseRoute.PATCH, path: (i) => `/api/sites/${i.siteId}/houses/${i.houseId}`, params: (i) => ({ ...i }), body: { name: "Renamed house" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/live/route.ts", method: "GET", handler: liveRoute.GET, path: (i) => `/api/sites/${i.siteId}/live`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/devices/[kind]/[id]/credential/route.ts", method: "POST", handler: credentialRoute.POST, path: (i) => `/api/sites/${i.siteId}/devices/plug/${i.plugId}/credential`, params: (i) => ({ siteId: i.siteId, kind: "plug", id: i.plugId }), body: {}, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/houses/[houseId]/route.ts", method: "DELETE", handler: houseRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/houses/${i.houseId}`, params: (i) => ({ ...i }), siteScoped: true, write: true },
];
