import { deleteBill, requireBill, updateBill } from "@/db/queries/bills";
import { siteRoute } from "@/lib/server/site-route";
import { billParams, billSchema } from "@/lib/schemas/bill";

const loadBill = ({ site, params }: { site: { id: string }; params: { billId: string } }) => requireBill({ siteId: site.id, billId: params.billId });

export const PUT = siteRoute({
  params: billParams,
  body: billSchema,
  action: "tariffs.manage",
  load: loadBill,
  handle: async ({ site, user, body, loaded }) => Response.json({ bill: await updateBill({ siteId: site.id, userId: user.id, before: loaded, input: body }) }),
});

export const DELETE = siteRoute({
  params: billParams,
  action: "tariffs.manage",
  load: loadBill,
  handle: async ({ site, user, loaded }) => {
    await deleteBill({ siteId: site.id, userId: user.id, bill: loaded });
    return new Response(null, { status: 204 });
  },
});
