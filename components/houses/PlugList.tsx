import type { PlugSummary } from "@/db/queries/houses";
import { APPLIANCE_KIND_LABELS } from "@/lib/domain";
import { DeviceStatus } from "./DeviceStatus";
import { formatAmps, formatWatts } from "./format";
import { PlugLoadNote } from "./PlugLoadNote";

type PlugListProps = { plugs: PlugSummary[]; now: Date; timeZone: string; mainsVoltage: number };

export function PlugList({ plugs, now, timeZone, mainsVoltage }: PlugListProps) {
  if (plugs.length === 0) return <p className="text-sm text-frost-600">No plugs in this house.</p>;
  return (
    <ul className="divide-y divide-frost-100">
      {plugs.map((plug) => (
        <li key={plug.id} className="py-2.5 first:pt-0 last:pb-0">
          <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
            <span className="font-medium text-frost-900">{plug.name}</span>
            <DeviceStatus online={plug.online} lastSeenAt={plug.lastSeenAt} now={now} timeZone={timeZone} />
          </div>
          <p className="mt-0.5 text-sm text-frost-700">
            {APPLIANCE_KIND_LABELS[plug.applianceKind]} · {formatWatts(plug.applianceWatts)}
            <span className="text-frost-500"> · {formatAmps(plug.ratedCurrentA)} plug</span>
          </p>
          <PlugLoadNote watts={plug.applianceWatts} ratedCurrentA={plug.ratedCurrentA} mainsVoltage={mainsVoltage} />
        </li>
      ))}
    </ul>
  );
}
