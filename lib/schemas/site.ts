import { z } from "zod";
import { CONTINUOUS_LOAD_PERCENT, DEGREE_DAY_METHODS } from "@/lib/domain";
import { currency, line, recordId, timeZone } from "./common";

export const siteParams = z.object({ siteId: recordId("site") });

const { min, max, label } = CONTINUOUS_LOAD_PERCENT;

export const siteChangeSchema = z
  .object({
    name: line("Name", 120),
    timeZone,
    currency,
    mainsVoltage: z
      .number({ error: "Mains voltage must be a number" })
      .int("Mains voltage must be a whole number of volts")
      .min(100, "Mains voltage must be at least 100")
      .max(250, "Mains voltage must be at most 250"),
    /** Percent of a plug's rating that a load running for hours may draw (80 in NEC 210.19(A)/210.20(A)). */
    continuousLoadPercent: z
      .number({ error: `${label} must be a number` })
      .int(`${label} must be a whole percent`)
      .min(min, `${label} must be at least ${min} %`)
      .max(max, `${label} must be at most ${max} %`),
    /** How the degree-day report counts a day's cold (reports only; the controller does not use it). */
    degreeDayMethod: z.enum(DEGREE_DAY_METHODS, { error: "Degree-day method must be uk_met_office or us_mean" }),
  })
  .partial();

export type SiteChange = z.infer<typeof siteChangeSchema>;

/** Settings the controller's decisions depend on; a change to one wakes it. */
const CONTROL_FIELDS = ["timeZone", "mainsVoltage", "continuousLoadPercent"] as const satisfies (keyof SiteChange)[];

export function changeAffectsControl(change: SiteChange): boolean {
  return CONTROL_FIELDS.some((field) => change[field] !== undefined);
}
