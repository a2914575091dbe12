import { z } from "zod";
import { DateTime } from "luxon";
import { decodeAuditCursor } from "@/lib/audit";
import { recordId } from "./common";

export const localDate = (label: string) =>
  z
    .string({ error: `${label} must be a date` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, `${label} must be a date like 2026-03-14`)
    .refine((s) => DateTime.fromISO(s).isValid, `${label} is not a real date`);

/** Page sizes of the activity list. */
export const AUDIT_PAGE = { default: 25, max: 100 } as const;

/** The filters of the activity page and of GET /api/sites/[siteId]/audit (query text). */
export const auditFilterSchema = z
  .object({
    userId: recordId("person").optional(),
    entityType: z.string().regex(/^[a-z_]{1,32}$/, "What must be a kind of thing such as house or member").optional(),
    action: z.string().regex(/^[a-z_]{1,32}\.[a-z_.]{1,31}$/, "Action must look like house.update").optional(),
    from: localDate("From").optional(),
    to: localDate("To").optional(),
    cursor: z.string().refine((s) => decodeAuditCursor(s) !== null, "Cursor is not one this list gave out").optional(),
    limit: z.coerce
      .number({ error: "Limit must be a number" })
      .int("Limit must be a whole number")
      .min(1, "Limit must be at least 1")
      .max(AUDIT_PAGE.max, `Limit must be at most ${AUDIT_PAGE.max}`)
      .default(AUDIT_PAGE.default),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { path: ["to"], message: "To must be on or after From" });

export type AuditFilter = z.infer<typeof auditFilterSchema>;
