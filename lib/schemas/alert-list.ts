import { z } from "zod";
import { ALERT_KINDS } from "@/lib/domain";
import { recordId } from "./common";

/** Page sizes of the alerts list. */
export const ALERT_PAGE = { default: 20, max: 100 } as const;

export const ALERT_LIST_STATUSES = ["open", "past"] as const;
export type AlertListStatus = (typeof ALERT_LIST_STATUSES)[number];

/** The keyset of the newest-first list: (raised_at, id) of the last alert shown. */
export type AlertCursor = { at: Date; id: number };

/** Opaque to clients: they hand back what they were given. */
export function encodeAlertCursor({ at, id }: AlertCursor): string {
  return `a1${at.getTime().toString(36)}-${id.toString(36)}`;
}

export function decodeAlertCursor(cursor: string): AlertCursor | null {
  const match = /^a1([0-9a-z]{1,11})-([0-9a-z]{1,11})$/.exec(cursor);
  if (!match) return null;
  const ms = parseInt(match[1]!, 36);
  const id = parseInt(match[2]!, 36);
  if (!Number.isSafeInteger(ms) || !Number.isSafeInteger(id) || id < 1) return null;
  return { at: new Date(ms), id };
}

/** GET /api/sites/[siteId]/alerts: open or past alerts, by house and kind, a page after the cursor. */
export const alertListQuerySchema = z.object({
  status: z.enum(ALERT_LIST_STATUSES, { error: "Status must be open or past" }).default("open"),
  houseId: recordId("house").optional(),
  kind: z.enum(ALERT_KINDS, { error: `Kind must be one of ${ALERT_KINDS.join(", ")}` }).optional(),
  cursor: z.string().refine((s) => decodeAlertCursor(s) !== null, "Cursor is not one this list gave out").optional(),
  limit: z.coerce
    .number({ error: "Limit must be a number" })
    .int("Limit must be a whole number")
    .min(1, "Limit must be at least 1")
    .max(ALERT_PAGE.max, `Limit must be at most ${ALERT_PAGE.max}`)
    .default(ALERT_PAGE.default),
});
export type AlertListQuery = z.infer<typeof alertListQuerySchema>;

/** An alert's id in a URL: its row number. */
export const alertParams = z.object({
  siteId: recordId("site"),
  alertId: z
    .string()
    .regex(/^[1-9]\d{0,14}$/, "must be an alert number")
    .transform(Number),
});

/** A house's alert rules in a URL. */
export const houseAlertRulesParams = z.object({ siteId: recordId("site"), houseId: recordId("house") });
