import { useSyncExternalStore } from "react";

const subscribe = () => () => {};

let cachedZones: string[] | undefined;

/** Every IANA zone this browser knows, plus UTC (which some engines leave out). */
function browserZones(): string[] {
  cachedZones ??= [...new Set(["UTC", ...Intl.supportedValuesOf("timeZone")])].sort();
  return cachedZones;
}

function browserZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC";
}

/**
 * The browser's time zone and zone list, or null while rendering on the server and
 * hydrating, so that server and browser render the same first markup.
 */
export function useBrowserTimeZones(): { zone: string; zones: string[] } | null {
  const zone = useSyncExternalStore(subscribe, browserZone, () => null);
  const zones = useSyncExternalStore(subscribe, browserZones, () => null);
  return zone && zones ? { zone, zones } : null;
}
