import type { SensorSummary } from "@/db/queries/houses";
import { LiveDeviceStatus } from "./LiveDeviceStatus";

type SensorListProps = { sensors: SensorSummary[]; timeZone: string };

export function SensorList({ sensors, timeZone }: SensorListProps) {
  if (sensors.length === 0) return <p className="text-sm text-frost-600">No sensors in this house.</p>;
  return (
    <ul className="divide-y divide-frost-100">
      {sensors.map((sensor) => (
        <li key={sensor.id} className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1 py-2.5 first:pt-0 last:pb-0">
          <span className="font-medium text-frost-900">{sensor.name}</span>
          <LiveDeviceStatus
            device="sensor"
            id={sensor.id}
            online={sensor.online}
            lastSeenAt={sensor.lastSeenAt}
            timeZone={timeZone}
          />
        </li>
      ))}
    </ul>
  );
}
