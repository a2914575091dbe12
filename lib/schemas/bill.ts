// An electricity bill as the owner enters it for the bill check: its dates (local,
// inclusive), what it says in kWh and money (tax included) and an optional label.
// The CSV upload checks each row with the same schema (lib/bills/csv.ts).
import { z } from "zod";
import { localDate, recordId } from "./common";
import { siteParams } from "./site";

export const billParams = siteParams.extend({ billId: recordId("bill") });

export const BILL_LIMITS = {
  /** Longer than any billing period in use (monthly, quarterly, yearly), short enough to catch a wrong year. */
  maxDays: 400,
  maxKwh: 10_000_000,
  maxAmount: 100_000_000,
} as const;

const DAY_MS = 86_400_000;

/** Days from one local date to another, both included. */
export function daysInPeriod(startsOn: string, endsOn: string): number {
  return Math.round((Date.parse(`${endsOn}T00:00:00Z`) - Date.parse(`${startsOn}T00:00:00Z`)) / DAY_MS) + 1;
}

const amount = (label: string, max: number, places: number) =>
  z
    .number({ error: `${label} must be a number` })
    .min(0, `${label} cannot be negative`)
    .max(max, `${label} must be at most ${max.toLocaleString("en")}`)
    .refine((v) => Math.abs(v * 10 ** places - Math.round(v * 10 ** places)) < 1e-6, `${label} has at most ${places} decimal places`);

export const billSchema = z
  .object({
    startsOn: localDate("From"),
    endsOn: localDate("To"),
    label: z
      .string({ error: "Label must be text" })
      .trim()
      .max(80, "Label must be at most 80 characters")
      .nullable()
      .transform((v) => (v ? v : null)),
    billedKwh: amount("kWh", BILL_LIMITS.maxKwh, 3),
    billedAmount: amount("Amount", BILL_LIMITS.maxAmount, 2),
  })
  .superRefine((b, ctx) => {
    if (b.endsOn < b.startsOn) {
      ctx.addIssue({ code: "custom", path: ["endsOn"], message: "To must be on or after From" });
    } else if (daysInPeriod(b.startsOn, b.endsOn) > BILL_LIMITS.maxDays) {
      ctx.addIssue({ code: "custom", path: ["endsOn"], message: `A bill covers at most ${BILL_LIMITS.maxDays} days` });
    }
  });

export type BillInput = z.input<typeof billSchema>;
export type Bill = z.output<typeof billSchema>;

export const BILL_CSV_LIMITS = { maxChars: 32_000, maxRows: 400 } as const;

export const billUploadSchema = z.object({
  csv: z
    .string({ error: "The file must be sent as text" })
    .min(1, "The file is empty")
    .max(BILL_CSV_LIMITS.maxChars, `The file is too large: a bill file may be at most ${BILL_CSV_LIMITS.maxChars / 1000} kB (${BILL_CSV_LIMITS.maxRows} bills)`),
});
