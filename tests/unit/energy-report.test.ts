import { describe, expect, it } from "vitest";
import { buildReport, bucketOf, type ReportCell } from "@/lib/energy/report";
import type { Tariff } from "@/lib/energy/tariff";

const EVERY_DAY = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"] as const;
const flat = (id: string, from: string, until: string | null, price: number, standing: number, tax: number): Tariff => ({
  id,
  name: id,
  kind: "flat",
  validFrom: from,
  validUntil: until,
  standingChargePerDay: standing,
  taxPercent: tax,
  rates: [{ id: `${id}-rate`, label: "All day", startsAt: "00:00", endsAt: "00:00", days: EVERY_DAY, pricePerKwh: price }],
});

const houses = [{ id: "h1", name: "Glasshouse" }];
const plugs = [
  { id: "p1", name: "Heater", houseId: "h1", metersEnergy: false, applianceWatts: 2000, retired: false },
  { id: "p2", name: "Metered heater", houseId: "h1", metersEnergy: true, applianceWatts: 1000, retired: false },
];
const H = 3_600_000;
const cell = (plugId: string, day: string, rateKey: string, hours: number, watts: number, meteredKwh: number | null = null): ReportCell => ({
  plugId,
  day,
  rateKey,
  onMs: hours * H,
  ratedWattMs: hours * H * watts,
  meteredWs: meteredKwh === null ? null : meteredKwh * 3_600_000,
  costedWs: meteredKwh === null ? hours * 3600 * watts : meteredKwh * 3_600_000,
});

describe("the report", () => {
  it("costs each kWh at its tariff with tax, and charges standing charges only for days begun", () => {
    const report = buildReport({
      fromDay: "2026-03-30",
      toDay: "2026-04-05",
      today: "2026-04-02",
      bucket: "day",
      tariffs: [flat("old", "2026-01-01", "2026-03-31", 0.2, 0.5, 5), flat("new", "2026-04-01", null, 0.3, 0.6, 0)],
      houses,
      plugs,
      cells: [cell("p1", "2026-03-31", "old-rate", 2, 2000), cell("p1", "2026-04-01", "new-rate", 1, 2000), cell("p2", "2026-04-01", "new-rate", 3, 1000, 2.5)],
    });
    // 4 kWh × 0.20 × 1.05; 2 kWh × 0.30; the metered heater's 2.5 metered kWh (not its 3 rated) × 0.30.
    expect(report.site.cost).toBeCloseTo(4 * 0.2 * 1.05 + 2 * 0.3 + 2.5 * 0.3, 9);
    expect(report.site.ratedKwh).toBeCloseTo(9, 9);
    expect(report.site.meteredKwh).toBeCloseTo(2.5, 9);
    // 30 and 31 March under the old tariff, 1 and 2 April under the new: 4 days begun of 7.
    expect(report.daysElapsed).toBe(4);
    expect(report.site.standingCharge).toBeCloseTo(2 * 0.5 * 1.05 + 2 * 0.6, 9);
    expect(report.site.tax).toBeCloseTo(4 * 0.2 * 0.05 + 2 * 0.5 * 0.05, 9);
    expect(report.tariffs.map((t) => [t.id, t.fromDay, t.toDay, t.days])).toEqual([
      ["old", "2026-03-30", "2026-03-31", 2],
      ["new", "2026-04-01", "2026-04-02", 2],
    ]);
    const series = report.series;
    expect(series.reduce((s, b) => s + (b.cost ?? 0) + b.standingCharge, 0)).toBeCloseTo(report.site.total!, 9);
  });

  it("leaves energy outside every tariff uncosted and says how much", () => {
    const report = buildReport({ fromDay: "2026-01-01", toDay: "2026-01-01", today: "2026-01-05", bucket: "day", tariffs: [], houses, plugs, cells: [cell("p1", "2026-01-01", "", 1, 2000)] });
    expect(report.site.cost).toBeNull();
    expect(report.site.total).toBeNull();
    expect(report.site.unpricedKwh).toBeCloseTo(2, 9);
  });

  it("groups days into ISO weeks from Monday and calendar months, clipped to the range", () => {
    expect(bucketOf("2026-12-03", "week")).toBe("2026-11-30"); // a Thursday; ISO 8601 weeks start on Monday
    expect(bucketOf("2026-12-03", "month")).toBe("2026-12-01");
    const report = buildReport({ fromDay: "2026-12-02", toDay: "2026-12-15", today: "2026-12-31", bucket: "week", tariffs: [], houses, plugs, cells: [] });
    expect(report.series.map((b) => [b.fromDay, b.toDay])).toEqual([
      ["2026-12-02", "2026-12-06"],
      ["2026-12-07", "2026-12-13"],
      ["2026-12-14", "2026-12-15"],
    ]);
  });
});
