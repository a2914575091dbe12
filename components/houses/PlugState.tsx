"use client";

import { formatInstant } from "./format";
import type { PlugLiveJson } from "./live-data";
import { causeWords, formatSiteTime, presentCause } from "./live-format";
import { useNow, useSiteLive } from "./use-site-live";

type State = "on" | "off" | "unknown";

const BADGE: Record<State, { label: string; box: string; mark: string }> = {
  on: { label: "On", box: "bg-soil-100 text-soil-900 ring-1 ring-soil-300", mark: "bg-soil-600" },
  off: { label: "Off", box: "bg-white text-frost-700 ring-1 ring-frost-300", mark: "border-[1.5px] border-frost-500" },
  unknown: {
    label: "Unknown",
    box: "border border-dashed border-frost-400 text-frost-600",
    mark: "border-[1.5px] border-dashed border-frost-400",
  },
};

/** On, off or unknown, told apart by the mark's shape as well as its colour. */
function StateBadge({ state }: { state: State }) {
  const { label, box, mark } = BADGE[state];
  return (
    <span className={`inline-flex shrink-0 items-center gap-1.5 rounded-md px-2 py-0.5 text-xs font-semibold ${box}`}>
      <span className={`size-2 rounded-full ${mark}`} aria-hidden="true" />
      {label}
    </span>
  );
}

type PlugStateProps = { plugId: string; name: string };

/** The plug's name with its switched state, why it is in that state, and since when. */
export function PlugState({ plugId, name }: PlugStateProps) {
  const live = useSiteLive();
  const now = useNow();
  const plug: PlugLiveJson | undefined = live?.data.plugs.find((p) => p.plugId === plugId);
  const state: State = plug?.on === true ? "on" : plug?.on === false ? "off" : "unknown";
  const since = plug?.since ? new Date(plug.since) : null;
  const timeZone = live?.timeZone ?? "UTC";
  const cause = plug ? presentCause(plug) : null;

  return (
    <>
      <div className="flex items-start justify-between gap-3">
        <span className="font-medium text-frost-900">{name}</span>
        <span aria-live="polite">
          <span className="sr-only">{name} is </span>
          <StateBadge state={state} />
        </span>
      </div>
      {plug ? (
        <p className="mt-0.5 text-sm text-frost-800">
          {causeWords({ cause })}
          {since ? (
            <span className="text-frost-600">
              {" "}
              · since{" "}
              <time dateTime={plug.since!} title={formatInstant(since, timeZone)}>
                {formatSiteTime(since, now, timeZone)}
              </time>
            </span>
          ) : null}
        </p>
      ) : null}
      {plug && plug.cause && cause !== plug.cause ? (
        <p className="mt-0.5 text-xs text-frost-600">Last switched by: {causeWords(plug)}.</p>
      ) : null}
      {plug?.acknowledged === false ? (
        <p className="mt-0.5 text-xs text-frost-600">Switch sent, waiting for the plug to confirm it.</p>
      ) : null}
    </>
  );
}
