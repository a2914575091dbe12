// Route cases of a plug's overrides and its live events.
import type { RouteCase } from "./case";
import * as overridesRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/route";
import * as overrideRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/overrides/[overrideId]/route";
import * as eventsRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/events/route";

const plug = (i: { siteId: string; plugId: string }) => ({ siteId: i.siteId, plugId: i.plugId });
// No such override: the plug is checked before the permission, the override after it.
const overrideId = "00000000-0000-4000-8000-00000000abcd";

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/plugs/[plugId]/overrides/route.ts", method: "GET", handler: overridesRoute.GET, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}/overrides`, params: plug, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/overrides/route.ts", method: "POST", handler: overridesRoute.POST, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}/overrides`, params: plug, body: { on: true, duration: "30m", reason: "Access check" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/overrides/[overrideId]/route.ts", method: "DELETE", handler: overrideRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}/overrides/${overrideId}`, params: (i) => ({ ...plug(i), overrideId }), siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/events/route.ts", method: "GET", handler: eventsRoute.GET, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}/events`, params: plug, siteScoped: true, write: false },
];
