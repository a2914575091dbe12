"use client";

import { useMemo, type ReactNode } from "react";
import type { SiteLiveJson } from "./live-data";
import { LiveSiteContext } from "./use-site-live";

/** Makes the site's live data, refreshed in the background, available to the cards inside. */
export function LiveSite({
  siteId,
  timeZone,
  initial,
  children,
}: {
  siteId: string;
  timeZone: string;
  initial: SiteLiveJson;
  children: ReactNode;
}) {
  const value = useMemo(() => ({ siteId, timeZone, initial }), [siteId, timeZone, initial]);
  return <LiveSiteContext value={value}>{children}</LiveSiteContext>;
}
