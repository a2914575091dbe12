"use client";

import { formatInstant } from "./format";
import { formatAgo } from "./live-format";
import { useNow, useSiteLive } from "./use-site-live";

/**
 * Says so, calmly, when no controller is switching this site's plugs. It follows the
 * live poll, so it comes and goes within seconds of the controller's heartbeat.
 */
export function ControllerBanner() {
  const live = useSiteLive();
  const now = useNow();
  const controller = live?.data.controller;
  if (!live || !controller || controller.running) return null;
  const lastBeat = controller.lastBeatAt ? new Date(controller.lastBeatAt) : null;
  return (
    <div role="status" className="mt-4 rounded-lg border border-frost-300 bg-frost-50 px-3 py-2.5 text-sm text-frost-900">
      <p>
        <span className="font-medium">Controller not running</span> — plugs are not being switched. Each plug keeps its last
        command until that command&rsquo;s lease runs out, then falls back to its own safe state.
      </p>
      <p className="mt-1 text-xs text-frost-700">
        {lastBeat ? (
          <>
            Last heard from{" "}
            <time dateTime={controller.lastBeatAt!} title={formatInstant(lastBeat, live.timeZone)}>
              {formatAgo(lastBeat, now)}
            </time>
            .
          </>
        ) : (
          "No controller has been heard from yet."
        )}{" "}
        This note goes away by itself once it is back.
      </p>
    </div>
  );
}
