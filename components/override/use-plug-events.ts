"use client";

import { useEffect, useState } from "react";
import type { HeardReport } from "./confirmation";
import { eventsUrl } from "./panel-data";

export type PlugEvents = {
  /** Whether the stream is open and the server hears the broker: reports arrive as they happen. */
  live: boolean;
  report: HeardReport | null;
  online: boolean | null;
  /** Bumped on every event, so callers can refresh what depends on it. */
  seq: number;
};

type ReportData = { on: boolean; receivedAt: number } | null;
type PresenceData = { online: boolean } | null;

/**
 * The plug's reports and presence as they happen (server-sent events). When the stream
 * drops, `live` turns false and the page falls back to refreshing; EventSource keeps
 * trying to reconnect by itself.
 */
export function usePlugEvents(siteId: string, plugId: string): PlugEvents {
  const [state, setState] = useState<PlugEvents>({ live: false, report: null, online: null, seq: 0 });
  useEffect(() => {
    if (typeof EventSource === "undefined") return;
    const source = new EventSource(eventsUrl(siteId, plugId));
    const report = (data: ReportData) => (data ? { on: data.on, receivedAtMs: data.receivedAt } : null);
    source.addEventListener("hello", (e) => {
      const data = JSON.parse((e as MessageEvent<string>).data) as { live: boolean; report: ReportData; presence: PresenceData };
      setState((s) => ({ live: data.live, report: report(data.report) ?? s.report, online: data.presence?.online ?? s.online, seq: s.seq + 1 }));
    });
    source.addEventListener("report", (e) => {
      const data = JSON.parse((e as MessageEvent<string>).data) as NonNullable<ReportData>;
      setState((s) => ({ ...s, report: report(data), online: true, seq: s.seq + 1 }));
    });
    source.addEventListener("presence", (e) => {
      const data = JSON.parse((e as MessageEvent<string>).data) as NonNullable<PresenceData>;
      setState((s) => ({ ...s, online: data.online, seq: s.seq + 1 }));
    });
    source.onerror = () => setState((s) => ({ ...s, live: false }));
    return () => source.close();
  }, [siteId, plugId]);
  return state;
}
