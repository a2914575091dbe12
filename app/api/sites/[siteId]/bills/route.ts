import { createBill, getBillChecks } from "@/db/queries/bills";
import { siteRoute } from "@/lib/server/site-route";
import { billSchema } from "@/lib/schemas/bill";
import { siteParams } from "@/lib/schemas/site";

/** The site's bills, each beside heating's computed share of its dates. */
export const GET = siteRoute({
  params: siteParams,
  action: "reports.view",
  handle: async ({ site }) => Response.json({ currency: site.currency, bills: await getBillChecks({ siteId: site.id }) }),
});

export const POST = siteRoute({
  params: siteParams,
  body: billSchema,
  action: "tariffs.manage",
  handle: async ({ site, user, body }) => Response.json({ bill: await createBill({ siteId: site.id, userId: user.id, input: body }) }, { status: 201 }),
});
