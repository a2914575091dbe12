// The energy report as CSV rows for the accounts: one row per plug and period, one per
// period's standing charge, and the total. The costs of all rows add up to the total.
import { csvNumber, csvText } from "@/lib/csv";
import type { EnergyReport } from "./report";

export function reportCsvRows(report: EnergyReport, { currency }: { currency: string }): string[][] {
  const header = ["period_from", "period_to", "row", "house", "plug", "runtime_h", "rated_kwh", "metered_kwh", "costed_kwh", `cost_${currency}`];
  const rows: string[][] = [header];
  const houseOf = new Map(report.houses.flatMap((h) => h.plugs.map((p) => [p.id, { house: h.name, plug: p }] as const)));
  for (const bucket of report.series) {
    for (const [plugId, f] of Object.entries(bucket.byPlug)) {
      const where = houseOf.get(plugId);
      if (!where) continue;
      rows.push([
        bucket.fromDay,
        bucket.toDay,
        "plug",
        csvText(where.house),
        csvText(where.plug.name),
        csvNumber(f.onHours, 3),
        csvNumber(f.ratedKwh, 3),
        csvNumber(f.meteredKwh, 3),
        csvNumber(f.costedKwh, 3),
        csvNumber(f.cost, 2),
      ]);
    }
    if (bucket.standingCharge > 0) rows.push([bucket.fromDay, bucket.toDay, "standing_charge", "", "", "", "", "", "", csvNumber(bucket.standingCharge, 2)]);
  }
  const s = report.site;
  rows.push([report.fromDay, report.toDay, "total", "", "", csvNumber(s.onHours, 3), csvNumber(s.ratedKwh, 3), csvNumber(s.meteredKwh, 3), csvNumber(s.costedKwh, 3), csvNumber(s.total, 2)]);
  return rows;
}
