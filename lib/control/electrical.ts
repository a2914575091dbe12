/** Current an appliance draws: I = P / V. */
export function currentDrawA(watts: number, mainsVoltage: number): number {
  return watts / mainsVoltage;
}

/**
 * True when the appliance would draw more than the plug is rated for. Settings that
 * make the draw unknowable (no voltage, NaN) count as overloaded: the plug stays off
 * until someone fixes them.
 */
export function isOverloaded(watts: number, mainsVoltage: number, ratedCurrentA: number): boolean {
  if (!(mainsVoltage > 0)) return true;
  return !(currentDrawA(watts, mainsVoltage) <= ratedCurrentA);
}
