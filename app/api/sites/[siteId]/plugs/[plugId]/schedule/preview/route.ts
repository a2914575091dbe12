import { getPlugPlan, loadSchedulePlug } from "@/db/queries/schedules";
import { parseWith } from "@/lib/server/http";
import { siteRoute } from "@/lib/server/site-route";
import { previewBodySchema, previewQuerySchema, plugScheduleParams } from "@/lib/schemas/schedule";
import { previewPlan } from "@/lib/schedules/preview";


const startOfMinute = (ms: number) => new Date(Math.floor(ms / 60_000) * 60_000);

/** The saved plan's next `hours` (24 to 168) from `from` (default now). */
export const GET = siteRoute({
  params: plugScheduleParams,
  action: "site.view",
  load: loadSchedulePlug,
  handle: async ({ request, loaded: plug, site }) => {
    const query = parseWith(previewQuerySchema, Object.fromEntries(new URL(request.url).searchParams));
    const { plan, overrides } = await getPlugPlan(plug);
    const from = query.from ? new Date(query.from) : startOfMinute(Date.now());
    return Response.json(previewPlan({ plan, timeZone: site.timeZone, overrides, from, hours: query.hours }));
  },
});

/**
 * A draft plan's preview, before it is saved, with the overrides in force. Checked as a
 * save would be except for the house's limits, which the editor shows beside the fields.
 * Reading only, so every member may ask.
 */
export const POST = siteRoute({
  params: plugScheduleParams,
  body: previewBodySchema,
  action: "site.view",
  load: loadSchedulePlug,
  handle: async ({ body, loaded: plug, site }) => {
    const { overrides } = await getPlugPlan(plug);
    const from = body.from ? new Date(body.from) : startOfMinute(Date.now());
    return Response.json(previewPlan({ plan: body.plan, timeZone: site.timeZone, overrides, from, hours: body.hours }));
  },
});
