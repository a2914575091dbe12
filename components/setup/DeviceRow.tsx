import Link from "next/link";
import { DeviceStatus } from "@/components/houses/DeviceStatus";
import { formatWatts } from "@/components/houses/format";
import { APPLIANCE_KIND_LABELS, type ApplianceKind } from "@/lib/domain";
import type { TrafficCounts } from "@/lib/device-traffic-words";
import { TrafficNote } from "./TrafficNote";

export type DeviceRowData = {
  id: string;
  kind: "plug" | "sensor";
  deviceId: string;
  name: string;
  online: boolean;
  lastSeenAt: Date | null;
  retiredAt: Date | null;
  applianceKind?: string;
  applianceWatts?: number;
  traffic?: TrafficCounts & { lastAt: Date | null };
};

/** One plug or sensor as a large link to its page: what it is, and whether it is heard. */
export function DeviceRow({ device, slug, now, timeZone }: { device: DeviceRowData; slug: string; now: Date; timeZone: string }) {
  const what =
    device.kind === "plug"
      ? `${APPLIANCE_KIND_LABELS[device.applianceKind as ApplianceKind] ?? "Plug"}${device.applianceWatts ? `, ${formatWatts(device.applianceWatts)}` : ""}`
      : "Sensor";
  return (
    <li className="overflow-hidden rounded-lg border border-frost-200 bg-white has-[a:hover]:border-leaf-400">
      <Link
        href={`/sites/${slug}/devices/${device.kind}/${device.id}`}
        className="flex min-h-14 flex-col gap-1 px-4 py-3 hover:bg-leaf-50 sm:flex-row sm:items-center sm:justify-between"
      >
        <span className="flex flex-col">
          <span className="font-semibold text-frost-950">
            {device.name}
            {device.retiredAt ? <span className="ml-2 rounded-full bg-frost-100 px-2 py-0.5 text-xs font-medium text-frost-700">Retired</span> : null}
          </span>
          <span className="text-sm text-frost-600">
            {what} · <span className="font-mono">{device.deviceId}</span>
          </span>
        </span>
        {device.retiredAt ? null : <DeviceStatus online={device.online} lastSeenAt={device.lastSeenAt} now={now} timeZone={timeZone} />}
      </Link>
      {device.traffic && !device.retiredAt ? <TrafficNote traffic={device.traffic} now={now} timeZone={timeZone} /> : null}
    </li>
  );
}
