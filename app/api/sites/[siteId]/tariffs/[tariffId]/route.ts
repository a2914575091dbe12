import { deleteTariff, requireTariff, updateTariff } from "@/db/queries/tariffs";
import { siteRoute } from "@/lib/server/site-route";
import { tariffParams, tariffSchema } from "@/lib/schemas/tariff";

const loadTariff = ({ site, params }: { site: { id: string }; params: { tariffId: string } }) => requireTariff({ siteId: site.id, tariffId: params.tariffId });

export const GET = siteRoute({
  params: tariffParams,
  action: "reports.view",
  load: loadTariff,
  handle: async ({ loaded: tariff }) => Response.json({ tariff }),
});

/** Saves the tariff whole; its rates are replaced by the ones sent. */
export const PUT = siteRoute({
  params: tariffParams,
  body: tariffSchema,
  action: "tariffs.manage",
  load: loadTariff,
  handle: async ({ site, user, body, loaded }) => Response.json(await updateTariff({ siteId: site.id, userId: user.id, before: loaded, input: body })),
});

export const DELETE = siteRoute({
  params: tariffParams,
  action: "tariffs.manage",
  load: loadTariff,
  handle: async ({ site, user, loaded }) => Response.json(await deleteTariff({ siteId: site.id, userId: user.id, tariff: loaded })),
});
