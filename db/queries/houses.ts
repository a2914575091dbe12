import "server-only";
import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { revokeDeviceCredentials } from "@/db/device-credentials";
import { houses, plugStates, plugs, sensorStates, sensors } from "@/db/schema";
import { sensorStaleAfterS } from "@/lib/control";
import { AppError } from "@/lib/errors";
import { groupBy } from "@/lib/group-by";
import { changedHouseSchema, type HouseChange, type HouseInput } from "@/lib/schemas/house";
import { parseWith } from "@/lib/server/http";
import { recordAudit } from "./audit";
import { changedFields } from "@/lib/changed-fields";

export type House = typeof houses.$inferSelect;
export type PlugSummary = Pick<
  typeof plugs.$inferSelect,
  "id" | "houseId" | "deviceId" | "name" | "applianceKind" | "applianceWatts" | "ratedCurrentA"
> & { online: boolean; lastSeenAt: Date | null };
export type SensorSummary = Pick<typeof sensors.$inferSelect, "id" | "houseId" | "deviceId" | "name" | "placement"> & {
  online: boolean;
  lastSeenAt: Date | null;
  /** How old its reading may be before the page calls it stale (sensorStaleAfterS). */
  staleAfterS: number;
};
export type HouseOverview = House & { plugs: PlugSummary[]; sensors: SensorSummary[] };

export async function getHousesBySite({ siteId }: { siteId: string }): Promise<House[]> {
  return getDb().select().from(houses).where(eq(houses.siteId, siteId)).orderBy(asc(houses.name));
}

/** Houses of a site with their plugs and sensors (explicit joins: MariaDB has no LATERAL). */
export async function getHouseOverviewsBySite({ siteId }: { siteId: string }): Promise<HouseOverview[]> {
  const db = getDb();
  const houseRows = await getHousesBySite({ siteId });
  if (houseRows.length === 0) return [];
  const ids = houseRows.map((h) => h.id);
  const [plugRows, sensorRows] = await Promise.all([
    db
      .select({
        id: plugs.id,
        houseId: plugs.houseId,
        deviceId: plugs.deviceId,
        name: plugs.name,
        applianceKind: plugs.applianceKind,
        applianceWatts: plugs.applianceWatts,
        ratedCurrentA: plugs.ratedCurrentA,
        online: sql<boolean>`COALESCE(${plugStates.online}, FALSE)`.mapWith(Boolean),
        lastSeenAt: plugStates.lastSeenAt,
        sensorId: plugs.sensorId,
        staleAfterS: plugs.staleAfterS,
      })
      .from(plugs)
      .leftJoin(plugStates, eq(plugStates.plugId, plugs.id))
      .where(and(eq(plugs.siteId, siteId), inArray(plugs.houseId, ids), isNull(plugs.retiredAt)))
      .orderBy(asc(plugs.name)),
    db
      .select({
        id: sensors.id,
        houseId: sensors.houseId,
        deviceId: sensors.deviceId,
        name: sensors.name,
        placement: sensors.placement,
        online: sql<boolean>`COALESCE(${sensorStates.online}, FALSE)`.mapWith(Boolean),
        lastSeenAt: sensorStates.lastSeenAt,
      })
      .from(sensors)
      .leftJoin(sensorStates, eq(sensorStates.sensorId, sensors.id))
      .where(and(eq(sensors.siteId, siteId), inArray(sensors.houseId, ids), isNull(sensors.retiredAt)))
      .orderBy(asc(sensors.name)),
  ]);
  const followerLimits = groupBy(plugRows, (p) => p.sensorId ?? "");
  const sensorsWithLimits = sensorRows.map((s) => ({
    ...s,
    staleAfterS: sensorStaleAfterS((followerLimits.get(s.id) ?? []).map((p) => p.staleAfterS)),
  }));
  const plugSummaries: PlugSummary[] = plugRows.map(({ sensorId: _sensorId, staleAfterS: _staleAfterS, ...plug }) => plug);
  return houseRows.map((house) => ({
    ...house,
    plugs: plugSummaries.filter((p) => p.houseId === house.id),
    sensors: sensorsWithLimits.filter((s) => s.houseId === house.id),
  }));
}

export async function getHouse({ siteId, houseId }: { siteId: string; houseId: string }): Promise<House | null> {
  const [row] = await getDb()
    .select()
    .from(houses)
    .where(and(eq(houses.siteId, siteId), eq(houses.id, houseId)))
    .limit(1);
  return row ?? null;
}

export async function requireHouse(ids: { siteId: string; houseId: string }): Promise<House> {
  const house = await getHouse(ids);
  if (!house) throw new AppError("not_found", "No such house in this site.");
  return house;
}

export async function createHouse({ siteId, userId, input }: { siteId: string; userId: string; input: HouseInput }) {
  const id = randomUUID();
  await getDb().transaction(async (tx) => {
    await tx.insert(houses).values({ id, siteId, ...input, notes: input.notes ?? null });
    await recordAudit(tx, { siteId, userId, action: "house.create", entityType: "house", entityId: id, after: input });
  });
  return (await getHouse({ siteId, houseId: id }))!;
}

export async function updateHouse({ house, userId, change }: { house: House; userId: string; change: HouseChange }) {
  parseWith(changedHouseSchema, { ...house, ...change });
  const { before, after } = changedFields(house, change);
  if (Object.keys(after).length === 0) return house;
  await getDb().transaction(async (tx) => {
    await tx.update(houses).set(after).where(eq(houses.id, house.id));
    await recordAudit(tx, { siteId: house.siteId, userId, action: "house.update", entityType: "house", entityId: house.id, before, after });
  });
  return (await getHouse({ siteId: house.siteId, houseId: house.id }))!;
}

/** Removes a house with its plugs and sensors (cascade); their MQTT credentials stop working with them. */
export async function deleteHouse({ house, userId }: { house: House; userId: string }) {
  await getDb().transaction(async (tx) => {
    const at = new Date();
    const [plugRows, sensorRows] = await Promise.all([
      tx.select({ deviceId: plugs.deviceId }).from(plugs).where(eq(plugs.houseId, house.id)),
      tx.select({ deviceId: sensors.deviceId }).from(sensors).where(eq(sensors.houseId, house.id)),
    ]);
    for (const { deviceId } of plugRows) await revokeDeviceCredentials(tx, { siteId: house.siteId, kind: "plug", deviceId }, at);
    for (const { deviceId } of sensorRows) await revokeDeviceCredentials(tx, { siteId: house.siteId, kind: "sensor", deviceId }, at);
    await tx.delete(houses).where(eq(houses.id, house.id));
    await recordAudit(tx, {
      siteId: house.siteId,
      userId,
      action: "house.delete",
      entityType: "house",
      entityId: house.id,
      before: house,
    });
  });
}
