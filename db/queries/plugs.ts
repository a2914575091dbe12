import "server-only";
import { and, eq } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { revokeDeviceCredentials } from "@/db/device-credentials";
import { plugs, sensors } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { plugRules, type Mains, type PlugChange, type PlugInput } from "@/lib/schemas/plug";
import { parseWith } from "@/lib/server/http";
import { recordAudit } from "./audit";
import { changedFields } from "@/lib/changed-fields";
import { assertDeviceIdFree, assertHouseOfSite, assertNotRetired, deviceIdTaken } from "./devices";
import { isDuplicateKey } from "./sites";

export type Plug = typeof plugs.$inferSelect;
type Site = Mains & { id: string };

export async function getPlug({ siteId, plugId }: { siteId: string; plugId: string }): Promise<Plug | null> {
  const [row] = await getDb()
    .select()
    .from(plugs)
    .where(and(eq(plugs.siteId, siteId), eq(plugs.id, plugId)))
    .limit(1);
  return row ?? null;
}

export async function requirePlug(ids: { siteId: string; plugId: string }): Promise<Plug> {
  const plug = await getPlug(ids);
  if (!plug) throw new AppError("not_found", "No such plug in this site.");
  return plug;
}

/** 400 unless the sensor is a working sensor of the site in the plug's house. */
async function assertSensorInHouse({ siteId, houseId, sensorId }: { siteId: string; houseId: string; sensorId: string }) {
  const [sensor] = await getDb()
    .select({ houseId: sensors.houseId, retiredAt: sensors.retiredAt })
    .from(sensors)
    .where(and(eq(sensors.siteId, siteId), eq(sensors.id, sensorId)))
    .limit(1);
  const problem = !sensor
    ? "no such sensor in this site"
    : sensor.retiredAt
      ? "that sensor is retired"
      : sensor.houseId !== houseId
        ? "the sensor must be in the plug’s house"
        : null;
  if (problem) throw new AppError("bad_input", `sensorId: ${problem}`, { sensorId: problem });
}

export async function createPlug({ site, userId, input }: { site: Site; userId: string; input: PlugInput }): Promise<Plug> {
  await assertHouseOfSite({ siteId: site.id, houseId: input.houseId });
  if (input.sensorId) await assertSensorInHouse({ siteId: site.id, houseId: input.houseId, sensorId: input.sensorId });
  parseWith(plugRules(site), input);
  await assertDeviceIdFree({ siteId: site.id, deviceId: input.deviceId });
  const id = randomUUID();
  try {
    await getDb().transaction(async (tx) => {
      await tx.insert(plugs).values({ id, siteId: site.id, ...input });
      await recordAudit(tx, { siteId: site.id, userId, action: "plug.create", entityType: "plug", entityId: id, after: input });
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw deviceIdTaken(input.deviceId);
    throw error;
  }
  return (await getPlug({ siteId: site.id, plugId: id }))!;
}

/** A change checked against the stored plug: same-house sensor, duty and the load rule hold for the result. */
export async function updatePlug({ site, plug, userId, change }: { site: Site; plug: Plug; userId: string; change: PlugChange }): Promise<Plug> {
  assertNotRetired(plug, "plug");
  const merged = { ...plug, ...change };
  if (change.houseId !== undefined) await assertHouseOfSite({ siteId: site.id, houseId: merged.houseId });
  if (merged.sensorId && (change.sensorId !== undefined || change.houseId !== undefined)) {
    await assertSensorInHouse({ siteId: site.id, houseId: merged.houseId, sensorId: merged.sensorId });
  }
  parseWith(plugRules(site), merged);
  const { before, after } = changedFields(plug, change);
  if (Object.keys(after).length === 0) return plug;
  await getDb().transaction(async (tx) => {
    await tx.update(plugs).set(after).where(eq(plugs.id, plug.id));
    await recordAudit(tx, { siteId: site.id, userId, action: "plug.update", entityType: "plug", entityId: plug.id, before, after });
  });
  return (await getPlug({ siteId: site.id, plugId: plug.id }))!;
}

/** Retired: no longer switched or signed in, its history kept; its credentials are revoked with it. */
export async function retirePlug({ site, plug, userId }: { site: Site; plug: Plug; userId: string }): Promise<Plug> {
  assertNotRetired(plug, "plug");
  const at = new Date();
  await getDb().transaction(async (tx) => {
    await tx.update(plugs).set({ retiredAt: at }).where(eq(plugs.id, plug.id));
    const revoked = await revokeDeviceCredentials(tx, { siteId: site.id, kind: "plug", deviceId: plug.deviceId }, at);
    await recordAudit(tx, {
      siteId: site.id,
      userId,
      action: "plug.retire",
      entityType: "plug",
      entityId: plug.id,
      before: { retiredAt: null },
      after: { retiredAt: at, credentialsRevoked: revoked },
    });
  });
  return (await getPlug({ siteId: site.id, plugId: plug.id }))!;
}
