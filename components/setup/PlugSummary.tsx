import { formatAmps, formatWatts } from "@/components/houses/format";
import type { Plug } from "@/db/queries/plugs";
import { APPLIANCE_KIND_LABELS, FAILSAFE_MODE_LABELS } from "@/lib/domain";

/** A plug's settings, read only. */
export function PlugSummary({ plug, sensorName }: { plug: Plug; sensorName: string | null }) {
  const failsafe =
    plug.failsafe === "duty"
      ? `${FAILSAFE_MODE_LABELS.duty}: on ${plug.failsafeDutyPercent ?? "?"} % of every ${plug.failsafeDutyPeriodS} s`
      : FAILSAFE_MODE_LABELS[plug.failsafe];
  const rows: [string, string][] = [
    ["Appliance", `${APPLIANCE_KIND_LABELS[plug.applianceKind]}, ${formatWatts(plug.applianceWatts)}`],
    ["Plug rating", formatAmps(plug.ratedCurrentA)],
    ["Meters energy", plug.metersEnergy ? "Yes" : "No"],
    ["Sensor its bands follow", sensorName ?? "None"],
    ["When the sensor goes quiet", `${failsafe} (quiet after ${plug.staleAfterS} s)`],
    ["Least time on / off", `${plug.minOnS} s / ${plug.minOffS} s`],
    ["Lease", `${plug.leaseS} s`],
  ];
  return (
    <dl className="grid gap-3 text-sm sm:grid-cols-2">
      {rows.map(([label, value]) => (
        <div key={label}>
          <dt className="text-xs text-frost-600">{label}</dt>
          <dd className="text-frost-950">{value}</dd>
        </div>
      ))}
    </dl>
  );
}
