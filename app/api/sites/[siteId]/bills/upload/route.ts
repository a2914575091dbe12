import { importBills } from "@/db/queries/bills";
import { parseBillCsv } from "@/lib/bills/csv";
import { AppError, errorBody } from "@/lib/errors";
import { siteRoute } from "@/lib/server/site-route";
import { billUploadSchema } from "@/lib/schemas/bill";
import { siteParams } from "@/lib/schemas/site";

/**
 * Bills from a CSV file's text: all saved, or none with each bad line and what is wrong
 * with it (`rows` beside the error). Bills whose dates are stored update those rows.
 */
export const POST = siteRoute({
  params: siteParams,
  body: billUploadSchema,
  action: "tariffs.manage",
  handle: async ({ site, user, body }) => {
    const parsed = parseBillCsv(body.csv);
    if (!parsed.ok) {
      const error = new AppError("bad_input", parsed.message, { csv: parsed.message });
      return Response.json({ ...errorBody(error), rows: parsed.rows }, { status: error.status });
    }
    const counts = await importBills({ siteId: site.id, userId: user.id, bills: parsed.bills });
    return Response.json({ ...counts, bills: parsed.bills.length });
  },
});
