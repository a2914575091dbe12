import { requireSensor, retireSensor, updateSensor } from "@/db/queries/sensors";
import { sensorChangeSchema, sensorParams } from "@/lib/schemas/sensor";
import { siteRoute } from "@/lib/server/site-route";

const loadSensor = ({ site, params }: { site: { id: string }; params: { sensorId: string } }) =>
  requireSensor({ siteId: site.id, sensorId: params.sensorId });

export const GET = siteRoute({
  params: sensorParams,
  action: "site.view",
  load: loadSensor,
  handle: async ({ loaded: sensor }) => Response.json({ sensor }),
});

export const PATCH = siteRoute({
  params: sensorParams,
  body: sensorChangeSchema,
  action: "devices.manage",
  load: loadSensor,
  handle: async ({ site, user, loaded: sensor, body }) =>
    Response.json({ sensor: await updateSensor({ site, sensor, userId: user.id, change: body }) }),
  wakes: { reason: "device" },
});

/** Retires the sensor: no longer read, its credentials revoked, its history kept. */
export const DELETE = siteRoute({
  params: sensorParams,
  action: "devices.manage",
  load: loadSensor,
  handle: async ({ site, user, loaded: sensor }) => Response.json({ sensor: await retireSensor({ site, sensor, userId: user.id }) }),
  wakes: { reason: "device" },
});
