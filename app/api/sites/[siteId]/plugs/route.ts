import { createPlug } from "@/db/queries/plugs";
import { plugSchema } from "@/lib/schemas/plug";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

export const POST = siteRoute({
  params: siteParams,
  body: plugSchema,
  action: "devices.manage",
  handle: async ({ site, user, body }) => Response.json({ plug: await createPlug({ site, userId: user.id, input: body }) }, { status: 201 }),
  wakes: ({ body }) => ({ reason: "device", plug: body.deviceId }),
});
