import { getPlugPlan, loadSchedulePlug, replacePlugPlan } from "@/db/queries/schedules";
import { siteRoute } from "@/lib/server/site-route";
import { planSchema, plugScheduleParams } from "@/lib/schemas/schedule";


export const GET = siteRoute({
  params: plugScheduleParams,
  action: "site.view",
  load: loadSchedulePlug,
  handle: async ({ loaded: plug, site }) => Response.json({ plug, timeZone: site.timeZone, ...(await getPlugPlan(plug)) }),
});

/** The whole plan at once: windows, outside windows, season and skip days. */
export const PUT = siteRoute({
  params: plugScheduleParams,
  body: planSchema,
  action: "schedules.manage",
  load: loadSchedulePlug,
  handle: async ({ loaded: plug, user, body, site }) =>
    Response.json({ plug, timeZone: site.timeZone, ...(await replacePlugPlan({ plug, userId: user.id, plan: body })) }),
  wakes: ({ loaded: plug }) => ({ reason: "schedule", plug: plug.deviceId }),
});
