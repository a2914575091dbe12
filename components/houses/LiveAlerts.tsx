"use client";

import { formatInstant } from "./format";
import type { AlertLiveJson } from "./live-data";
import { alertWords, formatAgo, formatSiteTime } from "./live-format";
import { useNow, useSiteLive } from "./use-site-live";

type Names = { houses: { id: string; name: string }[]; plugs: { id: string; name: string }[] };

function Raised({ alert, now, timeZone }: { alert: AlertLiveJson; now: Date; timeZone: string }) {
  const at = new Date(alert.raisedAt);
  return (
    <time dateTime={alert.raisedAt} title={formatInstant(at, timeZone)}>
      {formatAgo(at, now)}
    </time>
  );
}

/**
 * The top of the houses page: the site's open alerts, each naming where it is, and a
 * quiet note when live updates have stopped coming. Spaces itself from what is above,
 * so that it takes no room when there is nothing to say.
 */
export function SiteAlerts({ names, alertsHref }: { names: Names; alertsHref?: string }) {
  const live = useSiteLive();
  const now = useNow();
  if (!live) return null;
  const { data, error, timeZone } = live;
  const alerts = data.openAlerts;

  return (
    <>
      {error ? (
        <p role="status" className="mt-4 rounded-lg border border-frost-200 bg-frost-100 px-3 py-2.5 text-sm text-frost-800">
          <span className="font-medium">Live updates paused.</span> {error.message} Showing what Cloche knew at{" "}
          {formatSiteTime(new Date(data.at), now, timeZone)}; trying again every few seconds.
        </p>
      ) : null}
      <section aria-label="Open alerts" aria-live="polite">
        {alerts.length > 0 ? (
          <div className="mt-4 rounded-card border border-soil-200 bg-soil-50 px-4 py-3">
            <h2 className="text-sm font-semibold text-soil-900">
              {alerts.length === 1 ? "One thing to look at" : `${alerts.length} things to look at`}
            </h2>
            <ul className="mt-2 flex flex-col gap-2">
              {alerts.map((alert) => {
                const house = names.houses.find((h) => h.id === alert.houseId);
                const plug = names.plugs.find((p) => p.id === alert.plugId);
                return (
                  <li key={alert.id} className="flex gap-2.5 text-sm">
                    <span
                      aria-hidden="true"
                      className={`mt-1.5 size-2 shrink-0 rounded-sm ${heatOrPower(alert.kind) ? "bg-ember-500" : "bg-soil-500"}`}
                    />
                    <div className="min-w-0">
                      <p className="text-soil-900">
                        <span className="font-medium">{alertWords(alert.kind)}</span>
                        {house ? (
                          <>
                            {" "}
                            in{" "}
                            <a href={`#house-${house.id}`} className="underline decoration-soil-300 underline-offset-2 hover:decoration-soil-600">
                              {house.name}
                            </a>
                          </>
                        ) : null}
                        {plug ? <span className="text-soil-800"> · {plug.name}</span> : null}
                      </p>
                      <p className="text-soil-800">{alert.message}</p>
                      <p className="text-xs text-soil-700">
                        Raised <Raised alert={alert} now={now} timeZone={timeZone} />
                      </p>
                    </div>
                  </li>
                );
              })}
            </ul>
            {alertsHref ? (
              <a href={alertsHref} className="mt-1 inline-flex min-h-11 items-center text-sm font-medium text-soil-900 underline underline-offset-2">
                See all alerts and who was told
              </a>
            ) : null}
          </div>
        ) : null}
      </section>
    </>
  );
}

const heatOrPower = (kind: string) => kind === "too_hot" || kind === "overload";

/** A house's own open alerts, in a line under its name. */
export function HouseAlerts({ houseId }: { houseId: string }) {
  const live = useSiteLive();
  const now = useNow();
  const alerts = live?.data.openAlerts.filter((a) => a.houseId === houseId) ?? [];
  if (!live || alerts.length === 0) return null;
  return (
    <ul aria-label="Open alerts in this house" className="flex flex-col gap-1 rounded-lg bg-soil-50 px-3 py-2 text-sm ring-1 ring-soil-200">
      {alerts.map((alert) => (
        <li key={alert.id} className="flex flex-wrap items-baseline justify-between gap-x-3 text-soil-900">
          <span className="font-medium">{alertWords(alert.kind)}</span>
          <span className="text-xs text-soil-700">
            <Raised alert={alert} now={now} timeZone={live.timeZone} />
          </span>
        </li>
      ))}
    </ul>
  );
}
