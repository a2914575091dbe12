// A site's electricity tariff as the tariff editor sends it whole and the handlers take
// it: name, kind, dates of validity, standing charge, tax and its unit rates. The rates
// are checked with the reports' own reading of them (tariffProblems), so a tariff the
// form accepts is one the reports can cost every minute of the week with. That a site's
// tariffs do not overlap in their dates depends on the stored rows and is checked by
// the handler (overlappingTariff).
import { z } from "zod";
import { tariffProblems } from "@/lib/energy/tariff";
import { TARIFF_KIND_LABELS, TARIFF_KINDS } from "@/lib/domain";
import { WEEKDAYS } from "@/lib/schedules/week";
import { line, localDate, recordId } from "./common";
import { siteParams } from "./site";

export const tariffParams = siteParams.extend({ tariffId: recordId("tariff") });

/** Bounds that catch a misplaced decimal point without ruling out any real tariff. */
export const TARIFF_LIMITS = {
  /** Per kWh in the site's currency (the dearest retail rates are a few units of any currency's cents; 100 leaves room for weak currencies). */
  maxPricePerKwh: 100,
  maxStandingChargePerDay: 1000,
  maxTaxPercent: 100,
  maxRates: 24,
} as const;

const CLOCK_RE = /^([01]\d|2[0-3]):[0-5]\d$/;

const clock = (label: string) =>
  z.string({ error: `${label} must be text` }).regex(CLOCK_RE, `${label} must be a time of day, HH:MM (00:00 to 23:59)`);

const money = (label: string, max: number, unit: string) =>
  z
    .number({ error: `${label} must be a number` })
    .min(0, `${label} cannot be negative`)
    .max(max, `${label} must be at most ${max} ${unit}`);

export const tariffRateSchema = z.object({
  label: line("Rate name", 40),
  startsAt: clock("Start"),
  endsAt: clock("End"),
  days: z
    .array(z.enum(WEEKDAYS, { error: "Days are MO, TU, WE, TH, FR, SA, SU" }), { error: "Days must be a list" })
    .min(1, "Tick at least one day")
    .refine((days) => new Set(days).size === days.length, "Each day once"),
  pricePerKwh: money("Price", TARIFF_LIMITS.maxPricePerKwh, "per kWh"),
});

export const tariffSchema = z
  .object({
    name: line("Name", 80),
    kind: z.enum(TARIFF_KINDS, { error: `Kind is ${TARIFF_KINDS.map((k) => TARIFF_KIND_LABELS[k].toLowerCase()).join(" or ")}` }),
    validFrom: localDate("Valid from"),
    validUntil: localDate("Valid until").nullable(),
    standingChargePerDay: money("Standing charge", TARIFF_LIMITS.maxStandingChargePerDay, "per day"),
    taxPercent: money("Tax", TARIFF_LIMITS.maxTaxPercent, "%"),
    rates: z
      .array(tariffRateSchema, { error: "Rates must be a list" })
      .max(TARIFF_LIMITS.maxRates, `At most ${TARIFF_LIMITS.maxRates} rates`),
  })
  .superRefine((t, ctx) => {
    if (t.validUntil !== null && t.validUntil < t.validFrom) {
      ctx.addIssue({ code: "custom", path: ["validUntil"], message: "Valid until must be on or after valid from" });
    }
    const labels = t.rates.map((r) => r.label.toLowerCase());
    labels.forEach((label, i) => {
      if (labels.indexOf(label) !== i) ctx.addIssue({ code: "custom", path: ["rates", i, "label"], message: "Give each rate its own name" });
    });
    const problems = tariffProblems({ kind: t.kind, rates: t.rates.map((r, i) => ({ ...r, id: String(i) })) });
    if (problems.length) ctx.addIssue({ code: "custom", path: ["rates"], message: problems.join(" ") });
  });

export type TariffInput = z.infer<typeof tariffSchema>;
export type TariffRateInput = z.infer<typeof tariffRateSchema>;
