// The energy report's figures for bench:reports: the roll-up rebuilt from the whole
// 5,000,000-switch log, then the site's monthly and yearly runtime/kWh/cost reports
// read from it (getEnergyReport, as the page reads them).
import { randomUUID } from "node:crypto";
import type { Figure, Section } from "./reports.bench";
import type { ReportData } from "./report-data";

const MONTH_TARGET_MS = 300;
const YEAR_TARGET_MS = 1000;
const RUNS = 7;

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/** The benchmark's site gets a two-rate tariff (once), so the reports have rates to split at. */
async function ensureTariff(data: ReportData) {
  const { getPool } = await import("../../db/client");
  const pool = getPool();
  const [found] = await pool.query("SELECT id FROM tariffs WHERE site_id = ? LIMIT 1", [data.siteId]);
  if ((found as unknown[]).length) return;
  const tariffId = randomUUID();
  await pool.query("INSERT INTO tariffs (id, site_id, name, kind, standing_charge_per_day, tax_percent, valid_from) VALUES (?, ?, 'Bench two-rate', 'time_of_use', 0.5, 5, '2025-01-01')", [tariffId, data.siteId]);
  await pool.query("INSERT INTO tariff_rates (id, tariff_id, label, starts_at, ends_at, days, price_per_kwh) VALUES (?, ?, 'Night', '00:30', '07:30', 'MO,TU,WE,TH,FR,SA,SU', 0.12), (?, ?, 'Day', '07:30', '00:30', 'MO,TU,WE,TH,FR,SA,SU', 0.29)", [
    randomUUID(),
    tariffId,
    randomUUID(),
    tariffId,
  ]);
}

const rebuildSection: Section = {
  key: "rebuild",
  title: "Energy roll-up rebuilt from the whole log (npm run energy:rebuild)",
  run: async (data) => {
    await ensureTariff(data);
    const { getDb, getPool } = await import("../../db/client");
    const { rebuildEnergyDays } = await import("../../db/energy-days");
    const started = performance.now();
    const done = await rebuildEnergyDays(getDb(), { siteIds: [data.siteId] });
    const seconds = (performance.now() - started) / 1000;
    const [[count]] = (await getPool().query("SELECT COUNT(*) AS n FROM energy_days")) as unknown as [{ n: number }[]];
    return [
      { name: "rebuild, whole log", value: Number(seconds.toFixed(1)), unit: "s", target: "(figure only)", ok: null, note: `${done.switches.toLocaleString("en")} switches of ${done.plugs} plugs` },
      { name: "rebuild rate", value: Math.round(done.switches / seconds), unit: "switches/s", target: "(figure only)", ok: null },
      { name: "roll-up rows", value: Number(count!.n), unit: "rows", target: "(figure only)", ok: null, note: "plug × local day × tariff rate" },
    ];
  },
};

const reportSection: Section = {
  key: "energy",
  title: "Runtime, kWh and cost reports (getEnergyReport, the page's query)",
  run: async (data) => {
    await ensureTariff(data);
    const { getEnergyReport } = await import("../../db/queries/energy");
    const figures: Figure[] = [];
    const now = data.end;
    for (const [name, fromDay, toDay, bucket, target] of [
      ["monthly report (October, by day)", "2026-10-01", "2026-10-31", "day", MONTH_TARGET_MS],
      ["monthly report (March, the clocks change, by day)", "2026-03-01", "2026-03-31", "day", MONTH_TARGET_MS],
      ["yearly report (by month)", "2025-11-01", "2026-10-31", "month", YEAR_TARGET_MS],
      ["yearly report (by week)", "2025-11-01", "2026-10-31", "week", YEAR_TARGET_MS],
    ] as const) {
      const times: number[] = [];
      let summary = "";
      for (let i = 0; i < RUNS; i++) {
        const started = performance.now();
        const report = await getEnergyReport({ siteId: data.siteId, fromDay, toDay, bucket, now });
        times.push(performance.now() - started);
        summary = `${Math.round(report.site.onHours).toLocaleString("en")} h, ${Math.round(report.site.costedKwh).toLocaleString("en")} kWh, ${report.site.total?.toFixed(2)} total`;
      }
      const value = median(times);
      figures.push({ name, value, unit: "ms", target: `< ${target} ms`, ok: value < target, note: summary });
    }
    return figures;
  },
};

export const ENERGY_SECTIONS: Section[] = [rebuildSection, reportSection];
