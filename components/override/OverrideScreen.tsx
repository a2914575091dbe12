"use client";

import { useEffect, useState } from "react";
import useSWR from "swr";
import { ActiveOverride } from "./ActiveOverride";
import { confirmationOf, type Press } from "./confirmation";
import { OverrideForm } from "./OverrideForm";
import { errorMessage, panelUrl, type OverridePanelJson } from "./panel-data";
import { PlugNow } from "./PlugNow";
import { RecentOverrides } from "./RecentOverrides";
import { usePlugEvents } from "./use-plug-events";

type Props = {
  siteId: string;
  timeZone: string;
  initial: OverridePanelJson;
  canCreate: boolean;
  canCancel: boolean;
};

async function fetchPanel(url: string): Promise<OverridePanelJson> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(await errorMessage(response));
  return (await response.json()) as OverridePanelJson;
}

function useTicking(start: string): Date {
  const [now, setNow] = useState(() => new Date(start));
  useEffect(() => {
    const timer = setInterval(() => setNow(new Date()), 1000);
    return () => clearInterval(timer);
  }, []);
  return now;
}

/**
 * The override page's live part: the plug's state, the override in force with its
 * confirmation, the press, and the recent overrides. Reports arrive as server-sent
 * events; while that stream is down the panel is refreshed every 3 s instead.
 */
export function OverrideScreen({ siteId, timeZone, initial, canCreate, canCancel }: Props) {
  const plugId = initial.plug.id;
  const events = usePlugEvents(siteId, plugId);
  const { data, mutate, error } = useSWR(panelUrl(siteId, plugId), fetchPanel, {
    fallbackData: initial,
    refreshInterval: events.live ? 60_000 : 3000,
    revalidateOnFocus: true,
  });
  const panel = data ?? initial;
  const now = useTicking(initial.at);
  const [press, setPress] = useState<Press | null>(null);

  // A report or presence change also changes "since", the cause and the guard: read them
  // again, and once more shortly after, when the controller has stored the switch.
  useEffect(() => {
    if (events.seq === 0) return;
    void mutate();
    const again = setTimeout(() => void mutate(), 1500);
    return () => clearTimeout(again);
  }, [events.seq, mutate]);

  const active = panel.active;
  const report = events.live ? events.report : panel.now.reportedOn === null ? null : { on: panel.now.reportedOn, receivedAtMs: null };
  const online = events.live ? events.online : panel.now.online;
  const confirmation = active && press && press.startsAtMs === Date.parse(active.startsAt) ? confirmationOf(press, report, online, now.getTime()) : null;

  return (
    <div className="flex flex-col gap-6">
      {error ? <p className="text-base text-ember-700">Could not refresh: {error.message}</p> : null}
      <PlugNow panel={panel} now={now} timeZone={timeZone} online={online} reportedOn={events.live && events.report ? events.report.on : null} />
      {active ? (
        <ActiveOverride
          siteId={siteId}
          plugId={plugId}
          override={active}
          confirmation={confirmation}
          canCancel={canCancel}
          now={now}
          timeZone={timeZone}
          onCancelled={() => {
            setPress(null);
            void mutate();
          }}
        />
      ) : null}
      {canCreate && !panel.plug.retiredAt ? (
        <section aria-labelledby="override-heading" className="flex flex-col gap-3">
          <h2 id="override-heading" className="text-lg font-semibold text-frost-950">
            {active ? "Change the override" : "Override the schedule"}
          </h2>
          <OverrideForm
            siteId={siteId}
            plugId={plugId}
            timeZone={timeZone}
            now={now}
            nextChangeAt={panel.nextChangeAt}
            onCreated={(created, answeredAtMs) => {
              setPress({ on: created.on, startsAtMs: Date.parse(created.startsAt), answeredAtMs });
              void mutate();
            }}
          />
        </section>
      ) : panel.plug.retiredAt ? (
        <p className="text-base text-frost-700">This plug is retired: it is no longer switched.</p>
      ) : (
        <p className="text-base text-frost-700">Your role lets you see this plug but not switch it.</p>
      )}
      <RecentOverrides overrides={panel.recent} now={now} timeZone={timeZone} />
    </div>
  );
}
