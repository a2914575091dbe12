/** Current an appliance draws: I = P / V. */
export function currentDrawA(watts: number, mainsVoltage: number): number {
  return watts / mainsVoltage;
}

export type LoadCheck = {
  /** What the appliance draws, I = P / V (NaN when the voltage is unknown). */
  currentA: number;
  /** The most a load that runs for hours may draw from this plug: its rating times the margin. */
  limitA: number;
  withinLimit: boolean;
};

/**
 * The continuous-load check: an appliance that runs for hours (a heater does) may draw
 * at most `continuousLoadPercent` of the plug's rated current (80 % in US practice,
 * NEC 210.19(A)/210.20(A)). Drawing exactly the limit is within it. Settings that make
 * the draw or the limit unknowable (no voltage, NaN, a margin outside 1–100 %) are not
 * within it: the plug stays off until someone fixes them.
 */
export function checkLoad({
  watts,
  mainsVoltage,
  ratedCurrentA,
  continuousLoadPercent,
}: {
  watts: number;
  mainsVoltage: number;
  ratedCurrentA: number;
  continuousLoadPercent: number;
}): LoadCheck {
  const currentA = mainsVoltage > 0 ? currentDrawA(watts, mainsVoltage) : Number.NaN;
  const limitA = (ratedCurrentA * continuousLoadPercent) / 100;
  return { currentA, limitA, withinLimit: isWithinContinuousLoad(watts, mainsVoltage, ratedCurrentA, continuousLoadPercent) };
}

/** checkLoad's answer alone, with nothing allocated: the decision asks it for every plug on every tick. */
export function isWithinContinuousLoad(watts: number, mainsVoltage: number, ratedCurrentA: number, continuousLoadPercent: number): boolean {
  const marginKnown = continuousLoadPercent > 0 && continuousLoadPercent <= 100;
  // Written so that NaN anywhere reads as not within the limit.
  return marginKnown && mainsVoltage > 0 && currentDrawA(watts, mainsVoltage) <= (ratedCurrentA * continuousLoadPercent) / 100;
}
