import type { OverrideViewJson } from "./panel-data";
import { formatSiteTime } from "./time";

function endWords(o: OverrideViewJson, now: Date, timeZone: string): string {
  if (o.cancelledAt) return `cancelled ${formatSiteTime(new Date(o.cancelledAt), now, timeZone)}${o.cancelledByName ? ` by ${o.cancelledByName}` : ""}`;
  const stops = o.stopsAt ? formatSiteTime(new Date(o.stopsAt), now, timeZone) : null;
  if (o.active) return stops ? `until ${stops}${o.untilNextChange ? " (schedule change)" : ""}` : "until cancelled";
  return stops ? `ended ${stops}` : "ended";
}

/** Who overrode this plug, to what, when and why: the newest first. */
export function RecentOverrides({ overrides, now, timeZone }: { overrides: OverrideViewJson[]; now: Date; timeZone: string }) {
  return (
    <section aria-labelledby="recent-overrides">
      <h2 id="recent-overrides" className="text-lg font-semibold text-frost-950">
        Recent overrides
      </h2>
      {overrides.length === 0 ? (
        <p className="mt-2 text-base text-frost-700">Nobody has overridden this plug yet.</p>
      ) : (
        <ul className="mt-2 divide-y divide-frost-200 rounded-xl border border-frost-200 bg-white">
          {overrides.map((o) => (
            <li key={o.id} className="px-4 py-3 text-base">
              <p className="font-medium text-frost-950">
                {o.on ? "On" : "Off"} · {formatSiteTime(new Date(o.startsAt), now, timeZone)} · {o.byName ?? "a former member"}
              </p>
              <p className="text-frost-700">{endWords(o, now, timeZone)}</p>
              {o.reason ? <p className="mt-0.5 text-frost-800">“{o.reason}”</p> : null}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
