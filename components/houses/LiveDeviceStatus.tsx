"use client";

import { DeviceStatus } from "./DeviceStatus";
import { useNow, useSiteLive } from "./use-site-live";

type LiveDeviceStatusProps = {
  device: "plug" | "sensor";
  id: string;
  /** What the page was rendered with, for a device the live data does not list yet. */
  online: boolean;
  lastSeenAt: Date | null;
  timeZone: string;
};

export function LiveDeviceStatus({ device, id, online, lastSeenAt, timeZone }: LiveDeviceStatusProps) {
  const live = useSiteLive();
  const now = useNow();
  const found =
    device === "plug" ? live?.data.plugs.find((p) => p.plugId === id) : live?.data.sensors.find((s) => s.sensorId === id);
  const seen = found ? found.lastSeenAt : lastSeenAt;
  return (
    <DeviceStatus
      online={found ? found.online : online}
      lastSeenAt={seen === null ? null : new Date(seen)}
      now={now}
      timeZone={timeZone}
    />
  );
}
