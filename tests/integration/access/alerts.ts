// Route cases of the alerts pages: the list, acknowledging, a house's rules, one's own
// alert e-mails and the daily summary time.
import { DEFAULT_ALERT_RULES } from "@/lib/alerts/rules";
import type { RouteCase } from "./case";
import * as alertsRoute from "@/app/api/sites/[siteId]/alerts/route";
import * as acknowledgeRoute from "@/app/api/sites/[siteId]/alerts/[alertId]/acknowledge/route";
import * as rulesRoute from "@/app/api/sites/[siteId]/alerts/rules/[houseId]/route";
import * as preferencesRoute from "@/app/api/sites/[siteId]/alerts/preferences/route";
import * as summaryRoute from "@/app/api/sites/[siteId]/alerts/summary-time/route";

const rulesFile = "app/api/sites/[siteId]/alerts/rules/[houseId]/route.ts";
const preferencesFile = "app/api/sites/[siteId]/alerts/preferences/route.ts";
/** No alert has this number: 401 and other sites are checked here, a viewer's 403 in alerts-routes.test.ts with a real alert. */
const someAlert = "987654321";

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/alerts/route.ts", method: "GET", handler: alertsRoute.GET, path: (i) => `/api/sites/${i.siteId}/alerts`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/alerts/[alertId]/acknowledge/route.ts", method: "POST", handler: acknowledgeRoute.POST, path: (i) => `/api/sites/${i.siteId}/alerts/${someAlert}/acknowledge`, params: (i) => ({ siteId: i.siteId, alertId: someAlert }), siteScoped: true, write: false },
  { file: rulesFile, method: "GET", handler: rulesRoute.GET, path: (i) => `/api/sites/${i.siteId}/alerts/rules/${i.houseId}`, params: (i) => ({ siteId: i.siteId, houseId: i.houseId }), siteScoped: true, write: false },
  { file: rulesFile, method: "PUT", handler: rulesRoute.PUT, path: (i) => `/api/sites/${i.siteId}/alerts/rules/${i.houseId}`, params: (i) => ({ siteId: i.siteId, houseId: i.houseId }), body: DEFAULT_ALERT_RULES, siteScoped: true, write: true },
  { file: preferencesFile, method: "GET", handler: preferencesRoute.GET, path: (i) => `/api/sites/${i.siteId}/alerts/preferences`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  // Every member, a viewer too, chooses their own e-mails: not a write a viewer is refused.
  { file: preferencesFile, method: "PUT", handler: preferencesRoute.PUT, path: (i) => `/api/sites/${i.siteId}/alerts/preferences`, params: (i) => ({ siteId: i.siteId }), body: { kinds: ["sensor_quiet"], quietFrom: "22:00", quietUntil: "07:00", dailySummary: false }, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/alerts/summary-time/route.ts", method: "PUT", handler: summaryRoute.PUT, path: (i) => `/api/sites/${i.siteId}/alerts/summary-time`, params: (i) => ({ siteId: i.siteId }), body: { summaryTime: "07:30" }, siteScoped: true, write: true },
];
