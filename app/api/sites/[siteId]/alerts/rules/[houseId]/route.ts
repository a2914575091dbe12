import { getHouseAlertRules, saveHouseAlertRules } from "@/db/queries/alert-rules";
import { alertRulesSchema } from "@/lib/alerts/rules";
import { houseAlertRulesParams } from "@/lib/schemas/alert-list";
import { siteRoute } from "@/lib/server/site-route";

const load = ({ site, params }: { site: { id: string }; params: { houseId: string } }) => getHouseAlertRules({ siteId: site.id, houseId: params.houseId });

/** A house's alert rules (°C), the defaults where none are saved. */
export const GET = siteRoute({
  params: houseAlertRulesParams,
  action: "alerts.view",
  load,
  handle: async ({ loaded }) => Response.json({ house: loaded }),
});

/** Saves a house's rules whole; the controller reloads the site so they act at once. */
export const PUT = siteRoute({
  params: houseAlertRulesParams,
  body: alertRulesSchema,
  action: "alerts.manage",
  load,
  handle: async ({ site, user, body, loaded }) =>
    Response.json({ house: await saveHouseAlertRules({ siteId: site.id, house: loaded, userId: user.id, rules: body }) }),
  wakes: { reason: "house" },
});
