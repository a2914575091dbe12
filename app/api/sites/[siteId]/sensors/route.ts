import { createSensor } from "@/db/queries/sensors";
import { sensorSchema } from "@/lib/schemas/sensor";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

export const POST = siteRoute({
  params: siteParams,
  body: sensorSchema,
  action: "devices.manage",
  handle: async ({ site, user, body }) => Response.json({ sensor: await createSensor({ site, userId: user.id, input: body }) }, { status: 201 }),
  wakes: { reason: "device" },
});
