import type { PlugSummary } from "@/db/queries/houses";
import { APPLIANCE_KIND_LABELS } from "@/lib/domain";
import { formatAmps, formatWatts } from "./format";
import { LiveDeviceStatus } from "./LiveDeviceStatus";
import type { Role } from "@/lib/domain";
import { PlugInForce } from "./PlugInForce";
import { PlugLinks } from "./PlugLinks";
import { PlugLoadNote } from "./PlugLoadNote";
import { PlugState } from "./PlugState";

type PlugListProps = {
  plugs: PlugSummary[];
  slug: string;
  role: Role;
  timeZone: string;
  mainsVoltage: number;
  continuousLoadPercent: number;
};

export function PlugList({ plugs, slug, role, timeZone, mainsVoltage, continuousLoadPercent }: PlugListProps) {
  if (plugs.length === 0) return <p className="text-sm text-frost-600">No plugs in this house.</p>;
  return (
    <ul className="divide-y divide-frost-100">
      {plugs.map((plug) => (
        <li key={plug.id} className="py-2.5 first:pt-0 last:pb-0">
          <PlugState plugId={plug.id} name={plug.name} />
          <PlugInForce plugId={plug.id} />
          <div className="mt-1 flex flex-wrap items-baseline justify-between gap-x-3 gap-y-0.5">
            <p className="text-xs text-frost-600">
              {APPLIANCE_KIND_LABELS[plug.applianceKind]} · {formatWatts(plug.applianceWatts)}
              <span className="text-frost-600"> · {formatAmps(plug.ratedCurrentA)} plug</span>
            </p>
            <LiveDeviceStatus device="plug" id={plug.id} online={plug.online} lastSeenAt={plug.lastSeenAt} timeZone={timeZone} />
          </div>
          <PlugLoadNote
            watts={plug.applianceWatts}
            ratedCurrentA={plug.ratedCurrentA}
            mainsVoltage={mainsVoltage}
            continuousLoadPercent={continuousLoadPercent}
          />
          <PlugLinks slug={slug} plugId={plug.id} plugName={plug.name} role={role} />
        </li>
      ))}
    </ul>
  );
}
