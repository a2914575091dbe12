import type { SiteLive } from "@/db/queries/live";

/** A value as it arrives through JSON: dates become ISO strings. */
type Json<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Json<U>[]
    : T extends object
      ? { [K in keyof T]: Json<T[K]> }
      : T;

export type SiteLiveJson = Json<SiteLive>;
export type SensorLiveJson = SiteLiveJson["sensors"][number];
export type PlugLiveJson = SiteLiveJson["plugs"][number];
export type AlertLiveJson = SiteLiveJson["openAlerts"][number];

/** The exact shape `GET /api/sites/[siteId]/live` sends, so first paint and polls agree. */
export function toSiteLiveJson(live: SiteLive): SiteLiveJson {
  return JSON.parse(JSON.stringify(live)) as SiteLiveJson;
}
