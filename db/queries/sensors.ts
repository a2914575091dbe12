import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { revokeDeviceCredentials } from "@/db/device-credentials";
import { sensors } from "@/db/schema";
import { AppError } from "@/lib/errors";
import type { SensorChange, SensorInput } from "@/lib/schemas/sensor";
import { recordAudit } from "./audit";
import { changedFields } from "@/lib/changed-fields";
import { assertDeviceIdFree, assertHouseOfSite, assertNotRetired, deviceIdTaken, getPlugsFollowing } from "./devices";
import { isDuplicateKey } from "./sites";

export type Sensor = typeof sensors.$inferSelect;

export async function getSensor({ siteId, sensorId }: { siteId: string; sensorId: string }): Promise<Sensor | null> {
  const [row] = await getDb()
    .select()
    .from(sensors)
    .where(and(eq(sensors.siteId, siteId), eq(sensors.id, sensorId)))
    .limit(1);
  return row ?? null;
}

export async function requireSensor(ids: { siteId: string; sensorId: string }): Promise<Sensor> {
  const sensor = await getSensor(ids);
  if (!sensor) throw new AppError("not_found", "No such sensor in this site.");
  return sensor;
}

/** The working sensors of a house, for a plug's choice of sensor. */
export async function getSensorsBySite({ siteId }: { siteId: string }) {
  return getDb()
    .select({ id: sensors.id, name: sensors.name, houseId: sensors.houseId, deviceId: sensors.deviceId })
    .from(sensors)
    .where(and(eq(sensors.siteId, siteId), isNull(sensors.retiredAt)))
    .orderBy(asc(sensors.name));
}

export async function createSensor({ site, userId, input }: { site: { id: string }; userId: string; input: SensorInput }): Promise<Sensor> {
  await assertHouseOfSite({ siteId: site.id, houseId: input.houseId });
  await assertDeviceIdFree({ siteId: site.id, deviceId: input.deviceId });
  const id = randomUUID();
  try {
    await getDb().transaction(async (tx) => {
      await tx.insert(sensors).values({ id, siteId: site.id, ...input });
      await recordAudit(tx, { siteId: site.id, userId, action: "sensor.create", entityType: "sensor", entityId: id, after: input });
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw deviceIdTaken(input.deviceId);
    throw error;
  }
  return (await getSensor({ siteId: site.id, sensorId: id }))!;
}

/** 409 while working plugs follow the sensor: a plug's sensor must stay in its house and in service. */
async function assertNoFollowers(site: { id: string }, sensor: Sensor, doing: string) {
  const followers = await getPlugsFollowing({ siteId: site.id, sensorId: sensor.id });
  if (followers.length === 0) return;
  const names = followers.map((p) => `“${p.name}”`).join(", ");
  throw new AppError("conflict", `Cannot ${doing} “${sensor.name}”: ${names} ${followers.length === 1 ? "follows" : "follow"} it. Choose another sensor for ${followers.length === 1 ? "that plug" : "those plugs"} first.`);
}

export async function updateSensor({ site, sensor, userId, change }: { site: { id: string }; sensor: Sensor; userId: string; change: SensorChange }): Promise<Sensor> {
  assertNotRetired(sensor, "sensor");
  if (change.houseId !== undefined && change.houseId !== sensor.houseId) {
    await assertHouseOfSite({ siteId: site.id, houseId: change.houseId });
    await assertNoFollowers(site, sensor, "move");
  }
  const { before, after } = changedFields(sensor, change);
  if (Object.keys(after).length === 0) return sensor;
  await getDb().transaction(async (tx) => {
    await tx.update(sensors).set(after).where(eq(sensors.id, sensor.id));
    await recordAudit(tx, { siteId: site.id, userId, action: "sensor.update", entityType: "sensor", entityId: sensor.id, before, after });
  });
  return (await getSensor({ siteId: site.id, sensorId: sensor.id }))!;
}

export async function retireSensor({ site, sensor, userId }: { site: { id: string }; sensor: Sensor; userId: string }): Promise<Sensor> {
  assertNotRetired(sensor, "sensor");
  await assertNoFollowers(site, sensor, "retire");
  const at = new Date();
  await getDb().transaction(async (tx) => {
    await tx.update(sensors).set({ retiredAt: at }).where(eq(sensors.id, sensor.id));
    const revoked = await revokeDeviceCredentials(tx, { siteId: site.id, kind: "sensor", deviceId: sensor.deviceId }, at);
    await recordAudit(tx, {
      siteId: site.id,
      userId,
      action: "sensor.retire",
      entityType: "sensor",
      entityId: sensor.id,
      before: { retiredAt: null },
      after: { retiredAt: at, credentialsRevoked: revoked },
    });
  });
  return (await getSensor({ siteId: site.id, sensorId: sensor.id }))!;
}
