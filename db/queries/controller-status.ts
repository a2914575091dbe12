import "server-only";
import { and, eq, isNull, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { controllerHeartbeats, sites } from "@/db/schema";
import { isControllerRunning } from "@/lib/control/heartbeat";

export type ControllerStatus = {
  /** A controller that has not stopped beat recently enough (lib/control/heartbeat.ts). */
  running: boolean;
  /** The latest beat of any controller (for the site, when given), stopped ones included. */
  lastBeatAt: Date | null;
};

/**
 * Whether a controller is switching plugs: for one site (a controller serving all sites,
 * or that site among its `sites`), or for any site when none is given.
 */
export async function getControllerStatus({ siteId, now = new Date() }: { siteId?: string; now?: Date } = {}): Promise<ControllerStatus> {
  const serves = siteId
    ? or(
        isNull(controllerHeartbeats.sites),
        sql`FIND_IN_SET((SELECT ${sites.slug} FROM ${sites} WHERE ${eq(sites.id, siteId)}), ${controllerHeartbeats.sites}) > 0`,
      )
    : undefined;
  const [latest] = await getDb()
    .select({
      anyBeat: sql<Date | null>`MAX(${controllerHeartbeats.beatAt})`.mapWith(controllerHeartbeats.beatAt),
      liveBeat: sql<Date | null>`MAX(CASE WHEN ${controllerHeartbeats.stoppedAt} IS NULL THEN ${controllerHeartbeats.beatAt} END)`.mapWith(
        controllerHeartbeats.beatAt,
      ),
    })
    .from(controllerHeartbeats)
    .where(and(serves));
  return { running: isControllerRunning(latest?.liveBeat ?? null, now), lastBeatAt: latest?.anyBeat ?? null };
}
