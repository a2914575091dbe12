import { acknowledgeAlert, getAlertForSite } from "@/db/queries/alerts";
import { alertParams } from "@/lib/schemas/alert-list";
import { siteRoute } from "@/lib/server/site-route";

/**
 * Someone has seen the alert and is on it: reminders stop. A second press answers with
 * the first acknowledgement and writes nothing; a cleared alert is a 409.
 */
export const POST = siteRoute({
  params: alertParams,
  action: "alerts.acknowledge",
  load: ({ site, params }) => getAlertForSite({ siteId: site.id, alertId: params.alertId }),
  handle: async ({ site, params, user }) =>
    Response.json({ acknowledgement: await acknowledgeAlert({ siteId: site.id, alertId: params.alertId, userId: user.id }) }),
});
