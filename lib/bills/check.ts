// The bill check: what a bill says beside what Cloche worked out for heating over the
// same dates, and what is left for everything else on the supply.

export type HeatingFigures = {
  /** kWh the cost is worked on (metered where a plug meters, rated otherwise). */
  kwh: number;
  /** Energy cost with tax; null when no tariff covers any of it. */
  energyCost: number | null;
  /** Standing charges with tax for the days that have begun. */
  standingCharge: number;
  /** Energy and standing charges; null when no tariff covers the period at all. */
  total: number | null;
  /** kWh that fell on days or times no tariff covers. */
  unpricedKwh: number;
  /** Days of the period up to today. */
  daysCounted: number;
};

export type BillFigures = { startsOn: string; endsOn: string; billedKwh: number | null; billedAmount: number | null };

export type BillCheck = {
  heating: HeatingFigures;
  /** Null until the bill's figures are entered. */
  rest: { kwh: number; amount: number | null } | null;
  /** Heating's part of the billed kWh, 0–1 (more than 1 when heating alone exceeds the bill). */
  heatingShare: number | null;
  notes: string[];
};

export function checkBill(bill: BillFigures, heating: HeatingFigures, periodDays: number): BillCheck {
  const notes: string[] = [];
  if (heating.daysCounted < periodDays) {
    notes.push(
      heating.daysCounted === 0
        ? "This period has not begun yet, so Cloche has nothing to count."
        : `Only ${heating.daysCounted} of the period’s ${periodDays} days have begun; heating is counted up to today.`,
    );
  }
  if (heating.unpricedKwh > 0.0005) {
    notes.push(`${heating.unpricedKwh.toFixed(1)} kWh of heating fell outside every tariff’s dates or times and is not costed: add or widen a tariff.`);
  }
  if (bill.billedKwh === null) return { heating, rest: null, heatingShare: null, notes };

  const rest = {
    kwh: bill.billedKwh - heating.kwh,
    amount: bill.billedAmount === null || heating.total === null ? null : bill.billedAmount - heating.total,
  };
  if (rest.kwh < 0) {
    notes.unshift(
      `Heating alone comes to ${(-rest.kwh).toFixed(1)} kWh more than the bill. Check that the bill’s dates match its meter readings, that the tariff and each heater’s wattage are right, and whether the bill was estimated rather than read.`,
    );
  }
  return { heating, rest, heatingShare: bill.billedKwh > 0 ? heating.kwh / bill.billedKwh : null, notes };
}
