/**
 * An on/off thermostat band with a differential: one edge switches the plug on, the
 * other off, and between them it keeps whatever state it is in.
 *
 * "heating" (heaters, lights, other): on at or below the low edge, off at or above the high edge.
 * "cooling" (fans): on at or above the high edge, off at or below the low edge.
 */
export type BandSense = "heating" | "cooling";

/** Which edge a temperature has reached, if any. */
export type BandEdge = "low" | "high" | "between";

export function bandSenseFor(applianceKind: string): BandSense {
  return applianceKind === "fan" ? "cooling" : "heating";
}

export function edgeReached(sense: BandSense, tempC: number, lowC: number, highC: number): BandEdge {
  // The edge that switches off is checked first, so a band whose edges overlap
  // (low at or above high) errs towards off.
  if (sense === "heating") {
    if (tempC >= highC) return "high";
    if (tempC <= lowC) return "low";
  } else {
    if (tempC <= lowC) return "low";
    if (tempC >= highC) return "high";
  }
  return "between";
}

/** The state an edge asks for: heating comes on at the low edge, cooling at the high one. */
export function edgeWantsOn(sense: BandSense, edge: "low" | "high"): boolean {
  return (edge === "low") === (sense === "heating");
}
