import "server-only";
import { and, asc, desc, eq, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { deviceCredentials, houses, plugStates, plugs, sensorStates, sensors } from "@/db/schema";
import { AppError } from "@/lib/errors";
import type { DeviceKind } from "@/lib/mqtt/topics";
import { getDeviceTrafficBySite, trafficKey, type DeviceTraffic } from "./device-traffic";

/** A plug or sensor of the site by its record id; 404 when it is not there. */
export async function getDeviceOfSite({ siteId, kind, id }: { siteId: string; kind: DeviceKind; id: string }) {
  const table = kind === "plug" ? plugs : sensors;
  const [row] = await getDb()
    .select({ id: table.id, deviceId: table.deviceId, name: table.name, retiredAt: table.retiredAt })
    .from(table)
    .where(and(eq(table.siteId, siteId), eq(table.id, id)))
    .limit(1);
  if (!row) throw new AppError("not_found", `No such ${kind} in this site.`);
  return row;
}

export type DeviceOfSite = Awaited<ReturnType<typeof getDeviceOfSite>>;

/** 409 for a retired device: it keeps its history and is changed no more. */
export function assertNotRetired(device: { retiredAt: Date | null; name: string }, kind: DeviceKind) {
  if (device.retiredAt) throw new AppError("conflict", `The ${kind} “${device.name}” is retired; it can no longer be changed.`);
}

/**
 * 409 when a plug or sensor of the site (retired ones too: their history keeps the
 * id) already has this device id, so a device's topics and sign-in stay its own.
 */
export async function assertDeviceIdFree({ siteId, deviceId }: { siteId: string; deviceId: string }) {
  const db = getDb();
  const [plug, sensor] = await Promise.all([
    db.select({ name: plugs.name, retiredAt: plugs.retiredAt }).from(plugs).where(and(eq(plugs.siteId, siteId), eq(plugs.deviceId, deviceId))).limit(1),
    db.select({ name: sensors.name, retiredAt: sensors.retiredAt }).from(sensors).where(and(eq(sensors.siteId, siteId), eq(sensors.deviceId, deviceId))).limit(1),
  ]);
  const taken = plug[0] ? { kind: "plug", ...plug[0] } : sensor[0] ? { kind: "sensor", ...sensor[0] } : null;
  if (taken) throw deviceIdTaken(deviceId, taken);
}

export function deviceIdTaken(deviceId: string, by?: { kind: string; name: string; retiredAt: Date | null }) {
  const who = by ? ` by the ${by.retiredAt ? "retired " : ""}${by.kind} “${by.name}”` : "";
  return new AppError("conflict", `Device id “${deviceId}” is already used${who} in this site; choose another.`, {
    deviceId: "is already used in this site",
  });
}

/** 400 unless the house belongs to the site. */
export async function assertHouseOfSite({ siteId, houseId }: { siteId: string; houseId: string }) {
  const [row] = await getDb()
    .select({ id: houses.id })
    .from(houses)
    .where(and(eq(houses.siteId, siteId), eq(houses.id, houseId)))
    .limit(1);
  if (!row) throw new AppError("bad_input", "houseId: no such house in this site", { houseId: "no such house in this site" });
}

export type DeviceListItem = {
  id: string;
  kind: DeviceKind;
  deviceId: string;
  name: string;
  houseId: string;
  houseName: string;
  online: boolean;
  lastSeenAt: Date | null;
  retiredAt: Date | null;
  /** Plugs only: the appliance and its watts. */
  applianceKind?: string;
  applianceWatts?: number;
  /** What the broker's limits did when it sent too much or too large; absent when never. */
  traffic?: DeviceTraffic;
};

/** Every plug and sensor of the site with its presence, by house; retired ones only when asked. */
export async function getDevicesBySite({ siteId, includeRetired }: { siteId: string; includeRetired: boolean }) {
  const db = getDb();
  const [plugRows, sensorRows, traffic] = await Promise.all([
    db
      .select({
        id: plugs.id,
        deviceId: plugs.deviceId,
        name: plugs.name,
        houseId: plugs.houseId,
        houseName: houses.name,
        applianceKind: plugs.applianceKind,
        applianceWatts: plugs.applianceWatts,
        online: sql<boolean>`COALESCE(${plugStates.online}, FALSE)`.mapWith(Boolean),
        lastSeenAt: plugStates.lastSeenAt,
        retiredAt: plugs.retiredAt,
      })
      .from(plugs)
      .innerJoin(houses, eq(houses.id, plugs.houseId))
      .leftJoin(plugStates, eq(plugStates.plugId, plugs.id))
      .where(and(eq(plugs.siteId, siteId), includeRetired ? undefined : isNull(plugs.retiredAt)))
      .orderBy(asc(houses.name), asc(plugs.name)),
    db
      .select({
        id: sensors.id,
        deviceId: sensors.deviceId,
        name: sensors.name,
        houseId: sensors.houseId,
        houseName: houses.name,
        online: sql<boolean>`COALESCE(${sensorStates.online}, FALSE)`.mapWith(Boolean),
        lastSeenAt: sensorStates.lastSeenAt,
        retiredAt: sensors.retiredAt,
      })
      .from(sensors)
      .innerJoin(houses, eq(houses.id, sensors.houseId))
      .leftJoin(sensorStates, eq(sensorStates.sensorId, sensors.id))
      .where(and(eq(sensors.siteId, siteId), includeRetired ? undefined : isNull(sensors.retiredAt)))
      .orderBy(asc(houses.name), asc(sensors.name)),
    getDeviceTrafficBySite({ siteId }),
  ]);
  const withTraffic = (d: DeviceListItem): DeviceListItem => {
    const t = traffic.get(trafficKey(d.kind, d.deviceId));
    return t ? { ...d, traffic: t } : d;
  };
  return {
    /** When presence was read: "last seen" is relative to it. */
    at: new Date(),
    plugs: plugRows.map((p) => withTraffic({ ...p, kind: "plug" })),
    sensors: sensorRows.map((s) => withTraffic({ ...s, kind: "sensor" })),
  };
}

export type CredentialStatus = { issuedAt: Date; revokedAt: Date | null } | null;

/** The device's latest credential: when it was issued and whether it is revoked (never the secret). */
export async function getCredentialStatus({ siteId, kind, deviceId }: { siteId: string; kind: DeviceKind; deviceId: string }): Promise<CredentialStatus> {
  const [row] = await getDb()
    .select({ issuedAt: deviceCredentials.createdAt, revokedAt: deviceCredentials.revokedAt })
    .from(deviceCredentials)
    .where(and(eq(deviceCredentials.siteId, siteId), eq(deviceCredentials.deviceKind, kind), eq(deviceCredentials.deviceId, deviceId)))
    .orderBy(desc(deviceCredentials.createdAt))
    .limit(1);
  return row ?? null;
}

/** The working plugs of the site that follow a sensor. */
export async function getPlugsFollowing({ siteId, sensorId }: { siteId: string; sensorId: string }) {
  return getDb()
    .select({ id: plugs.id, name: plugs.name, houseId: plugs.houseId })
    .from(plugs)
    .where(and(eq(plugs.siteId, siteId), eq(plugs.sensorId, sensorId), isNull(plugs.retiredAt)))
    .orderBy(asc(plugs.name));
}


/** The working plugs of a house that follow no sensor. */
export async function getPlugsWithoutSensor({ siteId, houseId }: { siteId: string; houseId: string }) {
  return getDb()
    .select({ id: plugs.id, name: plugs.name })
    .from(plugs)
    .where(and(eq(plugs.siteId, siteId), eq(plugs.houseId, houseId), isNull(plugs.sensorId), isNull(plugs.retiredAt)))
    .orderBy(asc(plugs.name));
}
