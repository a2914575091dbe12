import { createTariff, getTariffsBySite } from "@/db/queries/tariffs";
import { siteRoute } from "@/lib/server/site-route";
import { siteParams } from "@/lib/schemas/site";
import { tariffSchema } from "@/lib/schemas/tariff";

export const GET = siteRoute({
  params: siteParams,
  action: "reports.view",
  handle: async ({ site }) => Response.json({ currency: site.currency, ...(await getTariffsBySite({ siteId: site.id, timeZone: site.timeZone })) }),
});

export const POST = siteRoute({
  params: siteParams,
  body: tariffSchema,
  action: "tariffs.manage",
  handle: async ({ site, user, body }) => Response.json(await createTariff({ siteId: site.id, userId: user.id, input: body }), { status: 201 }),
});
