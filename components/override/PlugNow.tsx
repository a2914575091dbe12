import { SWITCH_CAUSE_LABELS } from "@/lib/domain";
import type { OverridePanelJson } from "./panel-data";
import { formatSiteTime } from "./time";

/** The plug's state now: on or off in large type, since when, why it is kept so (and why it last switched, when that differs), and what holds a change back. */
export function PlugNow({
  panel,
  now,
  timeZone,
  online,
  reportedOn,
}: {
  panel: OverridePanelJson;
  now: Date;
  timeZone: string;
  online: boolean | null;
  /** The plug's own latest report heard live, which may be newer than the stored state. */
  reportedOn: boolean | null;
}) {
  const state = panel.now;
  const on = reportedOn ?? state.reportedOn ?? state.on;
  // "Since" and the cause belong to the stored state: hide them while a newer report is not stored yet.
  const stored = on === (state.reportedOn ?? state.on);
  const since = stored && state.since ? new Date(state.since) : null;
  const guard = state.guardUntil ? new Date(state.guardUntil) : null;
  const cause = state.presentCause ?? state.cause;
  const isOnline = online ?? state.online;
  return (
    <section aria-labelledby="plug-now" className="rounded-xl border-2 border-frost-300 bg-white p-4">
      <h2 id="plug-now" className="text-sm font-semibold uppercase tracking-wide text-frost-600">
        Now
      </h2>
      <p className="mt-1 flex items-center gap-3" aria-live="polite">
        <span
          aria-hidden="true"
          className={`inline-block size-5 rounded-full ${on === true ? "bg-soil-600" : on === false ? "border-[3px] border-frost-600" : "border-[3px] border-dashed border-frost-400"}`}
        />
        <span className="text-4xl font-bold text-frost-950">{on === true ? "On" : on === false ? "Off" : "Not known"}</span>
      </p>
      <p className="mt-2 text-base text-frost-800">
        {!stored ? "Just reported by the plug" : cause ? SWITCH_CAUSE_LABELS[cause] : "Not switched by Cloche yet"}
        {since ? <span className="text-frost-600"> · since {formatSiteTime(since, now, timeZone)}</span> : null}
      </p>
      {state.cause && state.presentCause && state.cause !== state.presentCause ? (
        <p className="mt-0.5 text-sm text-frost-700">Last switched by: {SWITCH_CAUSE_LABELS[state.cause]}</p>
      ) : null}
      {state.pendingOn !== null ? (
        <p className="mt-1 text-base text-frost-800">Switching {state.pendingOn ? "on" : "off"}: waiting for the plug to answer.</p>
      ) : null}
      {guard && guard > now ? (
        <p className="mt-2 rounded-lg bg-soil-50 px-3 py-2 text-base font-medium text-soil-900">
          Waiting out the minimum {on ? "on" : "off"} time — switches at {formatSiteTime(guard, now, timeZone)}
        </p>
      ) : null}
      {!isOnline ? (
        <p role="alert" className="mt-2 rounded-lg bg-ember-50 px-3 py-2 text-base font-medium text-ember-800">
          The plug is offline: Cloche cannot reach it, so it cannot be switched until it is heard again.
        </p>
      ) : null}
    </section>
  );
}
