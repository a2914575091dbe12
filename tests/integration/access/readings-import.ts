// Route cases of the sensor history import: the preview and the import itself.
import type { RouteCase } from "./case";
import * as importRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/import/route";
import * as previewRoute from "@/app/api/sites/[siteId]/sensors/[sensorId]/import/preview/route";

const query = new URLSearchParams({
  timeColumn: "Time",
  temperatureColumn: "Temperature",
  humidityColumn: "",
  dateFormat: "iso",
  timeZone: "Europe/London",
  unit: "c",
  decimal: ".",
  fileName: "export.csv",
}).toString();
const body = "Time,Temperature\n2026-01-10 08:00,5\n";

export const cases: RouteCase[] = [
  {
    file: "app/api/sites/[siteId]/sensors/[sensorId]/import/preview/route.ts",
    method: "POST",
    handler: previewRoute.POST,
    path: (i) => `/api/sites/${i.siteId}/sensors/${i.sensorId}/import/preview?${query}`,
    params: (i) => ({ siteId: i.siteId, sensorId: i.sensorId }),
    body,
    siteScoped: true,
    write: true,
  },
  {
    file: "app/api/sites/[siteId]/sensors/[sensorId]/import/route.ts",
    method: "POST",
    handler: importRoute.POST,
    path: (i) => `/api/sites/${i.siteId}/sensors/${i.sensorId}/import?${query}`,
    params: (i) => ({ siteId: i.siteId, sensorId: i.sensorId }),
    body,
    siteScoped: true,
    write: true,
  },
];
