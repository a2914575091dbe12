"use client";

import { useState } from "react";
import useSWR from "swr";
import { Notice } from "@/components/ui/Notice";
import { groupBy } from "@/lib/group-by";
import { DeviceRow, type DeviceRowData } from "./DeviceRow";

type Listed = Omit<DeviceRowData, "lastSeenAt" | "retiredAt" | "traffic"> & {
  houseId: string;
  houseName: string;
  lastSeenAt: string | null;
  retiredAt: string | null;
  traffic?: Omit<NonNullable<DeviceRowData["traffic"]>, "lastAt"> & { lastAt: string | null };
};
export type DeviceListJson = { plugs: Listed[]; sensors: Listed[] };
type Answer = DeviceListJson & { at: string };
type Fetched = DeviceListJson & { at: number };

async function fetchDevices(url: string): Promise<Fetched> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  const body = (await response.json().catch(() => null)) as (Answer & { error?: { message: string } }) | null;
  if (!response.ok || !body) throw new Error(body?.error?.message ?? `Cloche answered with status ${response.status}.`);
  return { plugs: body.plugs, sensors: body.sensors, at: new Date(body.at).getTime() };
}

const date = (at: string | null) => (at ? new Date(at) : null);
const asRow = (d: Listed): DeviceRowData => ({
  ...d,
  lastSeenAt: date(d.lastSeenAt),
  retiredAt: date(d.retiredAt),
  traffic: d.traffic && { ...d.traffic, lastAt: date(d.traffic.lastAt) },
});

type DeviceListProps = { siteId: string; slug: string; timeZone: string; houses: { id: string; name: string }[]; initial: DeviceListJson; renderedAt: number };

/** Every plug and sensor of the site by house, with presence kept fresh; retired ones on request. */
export function DeviceList({ siteId, slug, timeZone, houses, initial, renderedAt }: DeviceListProps) {
  const [showRetired, setShowRetired] = useState(false);
  const url = `/api/sites/${siteId}/devices?retired=${showRetired ? 1 : 0}`;
  const { data, error } = useSWR(url, fetchDevices, {
    refreshInterval: 15_000,
    fallbackData: showRetired ? undefined : { ...initial, at: renderedAt },
  });
  const now = new Date(data?.at ?? renderedAt);
  const devices = data ? [...data.plugs, ...data.sensors] : [];
  const byHouse = groupBy(devices, (d) => d.houseId);

  return (
    <div className="flex flex-col gap-4">
      <label className="flex min-h-11 items-center gap-3 self-start text-sm text-frost-900">
        <input type="checkbox" className="size-5 accent-leaf-700" checked={showRetired} onChange={(e) => setShowRetired(e.target.checked)} />
        Show retired devices
      </label>
      {error ? <Notice tone="error">Could not refresh the devices: {(error as Error).message}</Notice> : null}
      {!data ? <p className="text-sm text-frost-600">Loading…</p> : null}
      {data && houses.map((house) => {
        const inHouse = byHouse.get(house.id) ?? [];
        return (
          <section key={house.id} aria-labelledby={`devices-${house.id}`} className="flex flex-col gap-2">
            <h2 id={`devices-${house.id}`} className="text-sm font-semibold uppercase tracking-wide text-frost-600">
              {house.name}
            </h2>
            {inHouse.length ? (
              <ul className="flex flex-col gap-2">
                {inHouse.map((d) => (
                  <DeviceRow key={`${d.kind}-${d.id}`} device={asRow(d)} slug={slug} now={now} timeZone={timeZone} />
                ))}
              </ul>
            ) : (
              <p className="text-sm text-frost-600">No devices.</p>
            )}
          </section>
        );
      })}
    </div>
  );
}
