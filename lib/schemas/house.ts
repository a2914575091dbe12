import { z } from "zod";
import { GLAZINGS, HOUSE_KINDS } from "@/lib/domain";
import { LIMITS_RULE, RIDGE_RULE, lowBelowHigh, ridgeAboveEaves } from "@/lib/house-shape";
import { decimalNumber, line, recordId, temperatureC } from "./common";

/** Bounds of a house's safety limits, in °C. */
export const HOUSE_LIMITS_C = { low: { min: -20, max: 30 }, high: { min: 15, max: 60 } } as const;

const houseFields = z.object({
  name: line("Name", 80),
  kind: z.enum(HOUSE_KINDS, { error: `Kind must be one of ${HOUSE_KINDS.join(", ")}` }),
  lengthM: decimalNumber("Length", 0.5, 500),
  widthM: decimalNumber("Width", 0.5, 200),
  eaveHeightM: decimalNumber("Eave height", 0.3, 20),
  ridgeHeightM: decimalNumber("Ridge height", 0.5, 25),
  glazing: z.enum(GLAZINGS, { error: `Glazing must be one of ${GLAZINGS.join(", ")}` }),
  airChangesPerHour: decimalNumber("Air changes per hour", 0.1, 10),
  lowLimitC: temperatureC("Low limit", HOUSE_LIMITS_C.low.min, HOUSE_LIMITS_C.low.max),
  highLimitC: temperatureC("High limit", HOUSE_LIMITS_C.high.min, HOUSE_LIMITS_C.high.max),
  notes: z.string({ error: "Notes must be text" }).trim().max(2000, "Notes must be at most 2000 characters").optional(),
});

const ridgeMessage = { path: [RIDGE_RULE.field], message: RIDGE_RULE.message };
const limitsMessage = { path: [LIMITS_RULE.field], message: LIMITS_RULE.message };

/** A new house; a typical leaky house, a 2 °C frost limit and a 35 °C cut-out unless given. */
export const houseSchema = houseFields
  .extend({
    airChangesPerHour: houseFields.shape.airChangesPerHour.default(1),
    lowLimitC: houseFields.shape.lowLimitC.default(2),
    highLimitC: houseFields.shape.highLimitC.default(35),
  })
  .refine(ridgeAboveEaves, ridgeMessage)
  .refine(lowBelowHigh, limitsMessage);

/** A change to a house: any of its fields, each under the same rules. */
export const houseChangeSchema = houseFields.partial();

/** A change merged with the stored house: the rules that tie fields together hold for the result. */
export const changedHouseSchema = z
  .object({ ridgeHeightM: z.number(), eaveHeightM: z.number(), lowLimitC: z.number(), highLimitC: z.number() })
  .refine(ridgeAboveEaves, ridgeMessage)
  .refine(lowBelowHigh, limitsMessage);

export type HouseInput = z.infer<typeof houseSchema>;
export type HouseFormInput = z.input<typeof houseSchema>;
export type HouseChange = z.infer<typeof houseChangeSchema>;

export const houseParams = z.object({ siteId: recordId("site"), houseId: recordId("house") });
