import { z } from "zod";
import { SWITCH_CAUSES } from "@/lib/domain";
import { decodeSwitchCursor } from "@/lib/switch-history";
import { localDate } from "./common";
import { recordId } from "./common";

/** Page sizes of the switch history. */
export const SWITCH_PAGE = { default: 50, max: 200 } as const;

const filterFields = {
  houseId: recordId("house").optional(),
  plugId: recordId("plug").optional(),
  cause: z.enum(SWITCH_CAUSES, { error: `Cause must be one of ${SWITCH_CAUSES.join(", ")}` }).optional(),
  userId: recordId("person").optional(),
  from: localDate("From").optional(),
  to: localDate("To").optional(),
};

const datesInOrder = (f: { from?: string; to?: string }) => !f.from || !f.to || f.from <= f.to;
const datesMessage = { path: ["to"], message: "To must be on or after From" };

/** The filters of the history page's form and of both history handlers (query text). */
export const switchFilterSchema = z.object(filterFields).refine(datesInOrder, datesMessage);
export type SwitchFilter = z.infer<typeof switchFilterSchema>;

/** GET /api/sites/[siteId]/switches: the filters, the cursor the last page gave, and a page size. */
export const switchPageSchema = z
  .object({
    ...filterFields,
    cursor: z.string().refine((s) => decodeSwitchCursor(s) !== null, "Cursor is not one this list gave out").optional(),
    limit: z.coerce
      .number({ error: "Limit must be a number" })
      .int("Limit must be a whole number")
      .min(1, "Limit must be at least 1")
      .max(SWITCH_PAGE.max, `Limit must be at most ${SWITCH_PAGE.max}`)
      .default(SWITCH_PAGE.default),
  })
  .refine(datesInOrder, datesMessage);
export type SwitchPageQuery = z.infer<typeof switchPageSchema>;
