// The reports benchmark: figures over the 5,000,000-switch log of tests/bench/report-data.ts
// (its own MariaDB, loaded on the first run and kept), each printed beside its target.
// Not a test: it prints what it measures and says which targets were missed.
//
//   npx tsx tests/bench/reports.bench.ts
//
// Sections are functions of the loaded data that return figures; `main(more)` runs the
// sections here and then any given to it, so further figures (the runtime/kWh/cost
// reports, the roll-up's rebuild) are added as sections without touching these.
//
// The query modules are `server-only`; outside Next that import resolves only under the
// "react-server" export condition, so the script starts itself again with it when needed.
import { spawnSync } from "node:child_process";
import os from "node:os";
import { fileURLToPath } from "node:url";
import type { ReportData } from "./report-data";

export type Figure = {
  name: string;
  value: number;
  unit: string;
  /** The target, in words, e.g. "< 50 ms". */
  target: string;
  /** Whether the value meets the target (null: no target, only a figure). */
  ok: boolean | null;
  note?: string;
};

/** `key` names the section for REPORTS_BENCH_ONLY (comma-separated keys: run only those). */
export type Section = { key: string; title: string; run: (data: ReportData) => Promise<Figure[]> };

const say = (line: string) => console.log(`[bench:reports] ${line}`);

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

async function timed<T>(work: () => Promise<T>): Promise<[number, T]> {
  const started = performance.now();
  const result = await work();
  return [performance.now() - started, result];
}

const RUNS = 7;
const DEEP = 100;
const PAGE_TARGET_MS = 50;

/** The history page: its first page and the page DEEP pages in, per filter; the median of RUNS runs each. */
const historySection: Section = {
  key: "history",
  title: "Switch history pages (getSwitchHistoryPage, 50 rows)",
  run: async (data) => {
    const { getSwitchHistoryPage } = await import("../../db/queries/switch-history");
    const { SWITCH_PAGE } = await import("../../lib/schemas/switch-history");
    const limit = SWITCH_PAGE.default;
    const house = data.houses[3]!;
    const filters: [string, Parameters<typeof getSwitchHistoryPage>[0]["filter"]][] = [
      ["whole site", {}],
      [`house (${house.name})`, { houseId: house.id }],
      ["cause: schedule", { cause: "schedule" }],
      ["cause: manual override", { cause: "override" }],
      ["one plug", { plugId: house.plugIds[2]! }],
      ["house + cause: manual override", { houseId: house.id, cause: "override" }],
      ["house + 30 local days", { houseId: house.id, from: "2026-03-15", to: "2026-04-13" }],
      ["person (overrides)", { userId: data.userIds[0]! }],
    ];
    const figures: Figure[] = [];
    for (const [label, filter] of filters) {
      const read = (cursor?: string) => getSwitchHistoryPage({ siteId: data.siteId, timeZone: data.timeZone, filter, cursor, limit });
      // Walk DEEP pages to get the deep page's cursor (also warms the caches as a busy site's would be).
      let cursor: string | undefined;
      let pages = 0;
      for (; pages < DEEP; pages++) {
        const page = await read(cursor);
        if (!page.nextCursor) break;
        cursor = page.nextCursor;
      }
      for (const [where, at] of [["first page", undefined], [`page ${pages + 1}`, cursor]] as const) {
        const times: number[] = [];
        let rows = 0;
        for (let i = 0; i < RUNS; i++) {
          const [ms, page] = await timed(() => read(at));
          times.push(ms);
          rows = page.rows.length;
        }
        const value = median(times);
        figures.push({ name: `${label}, ${where}`, value, unit: "ms", target: `< ${PAGE_TARGET_MS} ms`, ok: value < PAGE_TARGET_MS, note: `${rows} rows` });
      }
    }
    return figures;
  },
};

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0);

const EXPORT_ROWS_TARGET = 1_000_000;
const RATE_TARGET = 100_000;
const RSS_TARGET_MB = 100;

/** The CSV export over a date range of about a million rows, through the handler's own stream; RSS sampled while it runs. */
const exportSection: Section = {
  key: "export",
  title: "CSV export (switchHistoryCsv, the export handler's stream)",
  run: async (data) => {
    const { switchHistoryCsv } = await import("../../lib/server/switch-history-csv");
    // 73 of the log's 365 days hold about a fifth of its 5,000,000 rows.
    const filter = { from: "2026-05-01", to: process.env.REPORTS_BENCH_EXPORT_TO ?? "2026-07-12" };
    globalThis.gc?.();
    const baseline = process.memoryUsage().rss;
    let peak = baseline;
    let peakUsage = process.memoryUsage();
    const sample = () => {
      const usage = process.memoryUsage();
      if (usage.rss > peak) {
        peak = usage.rss;
        peakUsage = usage;
      }
    };
    const sampler = setInterval(sample, 20);
    let lines = 0;
    let bytes = 0;
    const cpuBefore = process.cpuUsage();
    const [ms] = await timed(async () => {
      const stream = await switchHistoryCsv({ siteId: data.siteId, timeZone: data.timeZone, filter });
      const reader = stream.getReader();
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        bytes += value.byteLength;
        for (let i = 0; i < value.length; i++) if (value[i] === 10) lines++;
        sample();
      }
    });
    clearInterval(sampler);
    const cpu = process.cpuUsage(cpuBefore);
    const cpuSeconds = (cpu.user + cpu.system) / 1e6;
    const rows = lines - 1;
    const rate = rows / (ms / 1000);
    const growthMb = (peak - baseline) / 1024 / 1024;
    return [
      { name: "rows exported", value: rows, unit: "rows", target: `≈ ${EXPORT_ROWS_TARGET.toLocaleString("en")}`, ok: rows >= EXPORT_ROWS_TARGET * 0.95, note: `${(bytes / 1024 / 1024).toFixed(0)} MB of CSV in ${(ms / 1000).toFixed(1)} s` },
      { name: "export rate", value: Math.round(rate), unit: "rows/s", target: `≥ ${RATE_TARGET.toLocaleString("en")} rows/s`, ok: rate >= RATE_TARGET },
      {
        name: "export rate per CPU second of this process",
        value: Math.round(rows / cpuSeconds),
        unit: "rows/s",
        target: "(figure only)",
        ok: null,
        note: `${cpuSeconds.toFixed(1)} CPU s here; the machine's load average was ${os.loadavg()[0]!.toFixed(1)} on ${os.cpus().length} cores`,
      },
      { name: "RSS growth while streaming", value: Number(growthMb.toFixed(1)), unit: "MB", target: `< ${RSS_TARGET_MB} MB`, ok: growthMb < RSS_TARGET_MB, note: `baseline ${mb(baseline)} MB, peak ${mb(peak)} MB: V8 heap ${mb(peakUsage.heapTotal)} MB, outside it ${mb(peakUsage.external)} MB` },
    ];
  },
};

/** The query plans of the history's shapes, printed for reading (no target). */
const plansSection: Section = {
  key: "plans",
  title: "Query plans (EXPLAIN) of the history's shapes",
  run: async (data) => {
    const { explainSwitchHistory } = await import("../../db/queries/switch-history");
    const house = data.houses[3]!;
    for (const [label, filter] of [
      ["whole site", {}],
      ["house", { houseId: house.id }],
      ["cause", { cause: "override" as const }],
      ["plug", { plugId: house.plugIds[2]! }],
    ] as const) {
      const plan = await explainSwitchHistory({ siteId: data.siteId, timeZone: data.timeZone, filter, limit: 50 });
      say(`  ${label}: ${plan.shape}`);
      for (const step of plan.rows) say(`    ${step}`);
    }
    return [];
  },
};

export const SECTIONS: Section[] = [historySection, exportSection, plansSection];

function print(section: Section, figures: Figure[]) {
  say(section.title);
  for (const f of figures) {
    const mark = f.ok === null ? " " : f.ok ? "✓" : "✗";
    const value = f.unit === "ms" ? f.value.toFixed(1) : f.value.toLocaleString("en");
    say(`  ${mark} ${f.name.padEnd(44)} ${`${value} ${f.unit}`.padStart(16)}   target ${f.target}${f.note ? `   (${f.note})` : ""}`);
  }
}

/** Runs this file's sections and then `more`; returns every figure, and sets a failing exit code when a target is missed. */
export async function main(more: Section[] = []): Promise<Figure[]> {
  const { openReportData } = await import("./report-data");
  const data = await openReportData();
  process.env.DATABASE_URL = data.url;
  process.env.BETTER_AUTH_SECRET ??= "bench-reports-not-a-secret-0123456789abcdef";
  const all: Figure[] = [];
  try {
    say(
      `${data.switches.toLocaleString("en")} switches, ${data.plugIds.length} plugs in ${data.houses.length} houses, ${data.timeZone}` +
        (data.loadedNow ? `; loaded now in ${data.loadSeconds!.toFixed(0)} s (${Math.round(data.switches / data.loadSeconds!).toLocaleString("en")} rows/s)` : "; already loaded"),
    );
    const only = process.env.REPORTS_BENCH_ONLY?.split(",").map((k) => k.trim());
    for (const section of [...SECTIONS, ...more].filter((s) => !only || only.includes(s.key))) {
      const figures = await section.run(data);
      if (figures.length) print(section, figures);
      all.push(...figures);
    }
  } finally {
    const { closeDb } = await import("../../db/client");
    await closeDb();
    await data.database.stop();
  }
  const missed = all.filter((f) => f.ok === false);
  say(missed.length ? `${missed.length} target(s) missed: ${missed.map((f) => f.name).join("; ")}` : "every target met.");
  if (missed.length) process.exitCode = 1;
  return all;
}

const isEntry = process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1];
if (isEntry) {
  if (!process.execArgv.some((a) => a.includes("react-server"))) {
    const again = spawnSync(process.execPath, ["--conditions=react-server", "--expose-gc", ...process.execArgv, process.argv[1]!, ...process.argv.slice(2)], { stdio: "inherit" });
    process.exit(again.status ?? 1);
  }
  const { ENERGY_SECTIONS } = await import("./energy-sections");
  await main(ENERGY_SECTIONS);
}
