// Route cases of the site's tariffs and the bill check.
import type { RouteCase } from "./case";
import { demoId } from "@/db/seed";
import * as tariffsRoute from "@/app/api/sites/[siteId]/tariffs/route";
import * as tariffRoute from "@/app/api/sites/[siteId]/tariffs/[tariffId]/route";
import * as billsRoute from "@/app/api/sites/[siteId]/bills/route";
import * as billRoute from "@/app/api/sites/[siteId]/bills/[billId]/route";
import * as uploadRoute from "@/app/api/sites/[siteId]/bills/upload/route";

/** A flat tariff after the demo's two-rate one ends (the demo's is open-ended, so the test gives it no dates to clash with). */
export const flatTariff = {
  name: "Flat test rate",
  kind: "flat",
  validFrom: "2031-01-01",
  validUntil: null,
  standingChargePerDay: 0.5,
  taxPercent: 5,
  rates: [{ label: "All day", startsAt: "00:00", endsAt: "00:00", days: ["MO", "TU", "WE", "TH", "FR", "SA", "SU"], pricePerKwh: 0.25 }],
};

export const demoBill = { startsOn: "2026-09-01", endsOn: "2026-11-30", label: "Autumn 2026", billedKwh: 1840.5, billedAmount: 612.4 };

const tariffId = demoId("tariff:two-rate");
const billId = demoId("bill:2026-q3");
const site = (i: { siteId: string }) => ({ siteId: i.siteId });

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/tariffs/route.ts", method: "GET", handler: tariffsRoute.GET, path: (i) => `/api/sites/${i.siteId}/tariffs`, params: site, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/tariffs/route.ts", method: "POST", handler: tariffsRoute.POST, path: (i) => `/api/sites/${i.siteId}/tariffs`, params: site, body: flatTariff, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/tariffs/[tariffId]/route.ts", method: "GET", handler: tariffRoute.GET, path: (i) => `/api/sites/${i.siteId}/tariffs/${tariffId}`, params: (i) => ({ siteId: i.siteId, tariffId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/tariffs/[tariffId]/route.ts", method: "PUT", handler: tariffRoute.PUT, path: (i) => `/api/sites/${i.siteId}/tariffs/${tariffId}`, params: (i) => ({ siteId: i.siteId, tariffId }), body: { ...flatTariff, validFrom: "2026-01-01" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/tariffs/[tariffId]/route.ts", method: "DELETE", handler: tariffRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/tariffs/${tariffId}`, params: (i) => ({ siteId: i.siteId, tariffId }), siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/bills/route.ts", method: "GET", handler: billsRoute.GET, path: (i) => `/api/sites/${i.siteId}/bills`, params: site, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/bills/route.ts", method: "POST", handler: billsRoute.POST, path: (i) => `/api/sites/${i.siteId}/bills`, params: site, body: { ...demoBill, startsOn: "2025-09-01", endsOn: "2025-11-30" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/bills/[billId]/route.ts", method: "PUT", handler: billRoute.PUT, path: (i) => `/api/sites/${i.siteId}/bills/${billId}`, params: (i) => ({ siteId: i.siteId, billId }), body: demoBill, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/bills/[billId]/route.ts", method: "DELETE", handler: billRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/bills/${billId}`, params: (i) => ({ siteId: i.siteId, billId }), siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/bills/upload/route.ts", method: "POST", handler: uploadRoute.POST, path: (i) => `/api/sites/${i.siteId}/bills/upload`, params: site, body: { csv: "from,to,kwh,amount\n2025-12-01,2026-02-28,2100,705.10\n" }, siteScoped: true, write: true },
];
