// Route cases of setting up a site: plugs, sensors, the device list, credentials, and each person's own settings.
import type { RouteCase } from "./case";
import * as devicesRoute from "@/app/api/sites/[siteId]/devices/route";
import * as plugsRoute from "@/app/api/sites/[siteId]/plugs/route";
import * as plugRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/route";
import * as sensorsRoute from "@/app/api/sites/[siteId]/sensors/route";
import * as sensorRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/route";
import * as credentialRoute from "@/app/api/sites/[siteId]/devices/[kind]/[id]/credential/route";
import * as meSettingsRoute from "@/app/api/me/settings/route";
import { demoId } from "@/db/seed";

export const newPlug = {
  name: "Test bench heater",
  deviceId: "access-bench-heater",
  houseId: demoId("house:glass"),
  applianceKind: "heater",
  applianceWatts: 1000,
  ratedCurrentA: 13,
};
export const newSensor = { name: "Test bench air", deviceId: "access-bench-air", houseId: demoId("house:glass") };

const site = (i: { siteId: string }) => ({ siteId: i.siteId });
const plug = (i: { siteId: string; plugId: string }) => ({ siteId: i.siteId, plugId: i.plugId });
const sensor = (i: { siteId: string; sensorId: string }) => ({ siteId: i.siteId, sensorId: i.sensorId });
const plugCredential = (i: { siteId: string; plugId: string }) => ({ siteId: i.siteId, kind: "plug", id: i.plugId });

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/devices/route.ts", method: "GET", handler: devicesRoute.GET, path: (i) => `/api/sites/${i.siteId}/devices`, params: site, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/plugs/route.ts", method: "POST", handler: plugsRoute.POST, path: (i) => `/api/sites/${i.siteId}/plugs`, params: site, body: newPlug, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/route.ts", method: "GET", handler: plugRoute.GET, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}`, params: plug, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/route.ts", method: "PATCH", handler: plugRoute.PATCH, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}`, params: plug, body: { name: "Renamed heater" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/plugs/[plugId]/route.ts", method: "DELETE", handler: plugRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/plugs/${i.plugId}`, params: plug, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/sensors/route.ts", method: "POST", handler: sensorsRoute.POST, path: (i) => `/api/sites/${i.siteId}/sensors`, params: site, body: newSensor, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/sensors/[sensorId]/route.ts", method: "GET", handler: sensorRoute.GET, path: (i) => `/api/sites/${i.siteId}/sensors/${i.sensorId}`, params: sensor, siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/sensors/[sensorId]/route.ts", method: "PATCH", handler: sensorRoute.PATCH, path: (i) => `/api/sites/${i.siteId}/sensors/${i.sensorId}`, params: sensor, body: { name: "Renamed air" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/sensors/[sensorId]/route.ts", method: "DELETE", handler: sensorRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/sensors/${i.sensorId}`, params: sensor, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/devices/[kind]/[id]/credential/route.ts", method: "DELETE", handler: credentialRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/devices/plug/${i.plugId}/credential`, params: plugCredential, siteScoped: true, write: true },
  { file: "app/api/me/settings/route.ts", method: "GET", handler: meSettingsRoute.GET, path: () => "/api/me/settings", params: () => ({}), siteScoped: false, write: false },
  { file: "app/api/me/settings/route.ts", method: "PUT", handler: meSettingsRoute.PUT, path: () => "/api/me/settings", params: () => ({}), body: { temperatureUnit: "f" }, siteScoped: false, write: true },
];
