import { useEffect } from "react";
import { useBrowserTimeZones } from "./use-browser-time-zone";

/**
 * Zones to offer, and once the page is live in the browser, the browser's own zone as
 * the field's value unless the person has already chosen one.
 */
export function useTimeZoneDefault(touched: boolean, setTimeZone: (zone: string) => void): readonly string[] | null {
  const browser = useBrowserTimeZones();
  const zone = browser?.zone;
  useEffect(() => {
    if (zone && !touched) setTimeZone(zone);
    // Only when the browser's zone becomes known, not on every edit.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [zone]);
  return browser?.zones ?? null;
}
