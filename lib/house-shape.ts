// The rules on a house that tie two of its fields together, used by the house schemas
// (a new house, a change merged with the stored house) and by the heat-loss sums.

/** The field a broken rule is reported against, and what to tell the person. */
export const RIDGE_RULE = { field: "ridgeHeightM", message: "Ridge height must be at least the eave height" } as const;

/** True when the ridge is not below the eaves (a flat roof, ridge = eaves, is a shape too). */
export function ridgeAboveEaves(house: { ridgeHeightM: number; eaveHeightM: number }): boolean {
  return house.ridgeHeightM >= house.eaveHeightM;
}

export const LIMITS_RULE = { field: "lowLimitC", message: "Low limit (frost) must be below the high limit (cut-out)" } as const;

/** The frost limit lies below the safety cut-out, so some temperature is allowed between them. */
export function lowBelowHigh(house: { lowLimitC: number; highLimitC: number }): boolean {
  return house.lowLimitC < house.highLimitC;
}
