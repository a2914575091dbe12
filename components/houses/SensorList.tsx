import type { SensorSummary } from "@/db/queries/houses";
import { DeviceStatus } from "./DeviceStatus";

type SensorListProps = { sensors: SensorSummary[]; now: Date; timeZone: string };

export function SensorList({ sensors, now, timeZone }: SensorListProps) {
  if (sensors.length === 0) return <p className="text-sm text-frost-600">No sensors in this house.</p>;
  return (
    <ul className="divide-y divide-frost-100">
      {sensors.map((sensor) => (
        <li key={sensor.id} className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1 py-2.5 first:pt-0 last:pb-0">
          <span className="font-medium text-frost-900">{sensor.name}</span>
          <DeviceStatus online={sensor.online} lastSeenAt={sensor.lastSeenAt} now={now} timeZone={timeZone} />
        </li>
      ))}
    </ul>
  );
}
