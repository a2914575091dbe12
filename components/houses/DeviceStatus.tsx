import { LastHeard } from "./LastHeard";

type DeviceStatusProps = { online: boolean; lastSeenAt: Date | null; now: Date; timeZone: string };

/** Online, offline since…, or never heard from: what Cloche knows of a device. */
export function DeviceStatus({ online, lastSeenAt, now, timeZone }: DeviceStatusProps) {
  if (!lastSeenAt && !online) {
    return (
      <span className="inline-flex items-center gap-1.5 text-xs text-frost-600">
        <span className="h-2 w-2 rounded-full border border-frost-400" aria-hidden="true" />
        Not heard from yet
      </span>
    );
  }
  return (
    <span className={`inline-flex items-center gap-1.5 text-xs ${online ? "text-leaf-800" : "text-frost-700"}`}>
      <span className={`h-2 w-2 rounded-full ${online ? "bg-leaf-500" : "bg-frost-400"}`} aria-hidden="true" />
      {online ? "Online" : "Offline"}
      {lastSeenAt ? (
        <span className="text-frost-600">
          · {online ? "heard" : "last heard"} <LastHeard at={lastSeenAt} now={now} timeZone={timeZone} />
        </span>
      ) : null}
    </span>
  );
}
