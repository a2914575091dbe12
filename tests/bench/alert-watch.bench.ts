// `npx tsx tests/bench/alert-watch.bench.ts`: what the house alert rules cost the
// controller (not a test). 10,000 plugs and 5,000 sensors in 500 houses: one reading
// through the rules, and one pass of the time-based rules over every plug and sensor,
// each the median of many runs. Alerts are counted, not stored.
import pino from "pino";
import { createAlertWatch } from "../../controller/alert-watch";
import type { Alerts } from "../../controller/alerts";
import type { Config } from "../../controller/config";
import { createRegistry } from "../../controller/registry";
import { DEFAULT_ALERT_RULES } from "../../lib/alerts/rules";
import { restoredState } from "../../lib/control/switch-lifecycle";

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)]!;

const now = Date.now();
const site = { id: "site", slug: "bench", timeZone: "Europe/London", mainsVoltage: 230, continuousLoadPercent: 80 };
const houses = Array.from({ length: 500 }, (_, i) => ({ id: `h${i}`, siteId: site.id, name: `House ${i}`, lowLimitC: 2, alertRules: DEFAULT_ALERT_RULES }));
const sensors = Array.from({ length: 5000 }, (_, i) => ({
  id: `s${i}`,
  siteId: site.id,
  houseId: `h${i % 500}`,
  deviceId: `sensor-${i}`,
  name: `Sensor ${i}`,
  placement: i % 10 === 0 ? ("outside" as const) : ("inside" as const),
}));
const plugs = Array.from({ length: 10_000 }, (_, i) => ({
  id: `p${i}`,
  siteId: site.id,
  houseId: `h${i % 500}`,
  deviceId: `plug-${i}`,
  name: `Plug ${i}`,
  applianceKind: i % 5 === 0 ? ("light" as const) : ("heater" as const),
  applianceWatts: 2000,
  ratedCurrentA: 13,
  metersEnergy: false,
  sensorId: `s${i % 5000}`,
  failsafe: "off" as const,
  failsafeDutyPercent: null,
  failsafeDutyPeriodS: 1200,
  staleAfterS: 600,
  outsideWindows: "off" as const,
  frostLowC: null,
  frostHighC: null,
  minOnS: 180,
  minOffS: 180,
  leaseS: 900,
  retiredAt: null,
  createdAt: new Date(now),
  updatedAt: new Date(now),
  highLimitC: 35,
}));
const config: Config = { sites: [site], houses, plugs, sensors, schedules: [], overrides: [] };

let raised = 0;
const alerts: Alerts = {
  load: async () => undefined,
  raise: () => void raised++,
  clear: () => undefined,
  generation: () => 0,
  isOpen: () => false,
};
const registry = createRegistry();
registry.apply(config, () => restoredState({ on: true, sinceMs: now - 3600_000, switchId: "x", pending: null, presentCause: "schedule", newestReportMs: null }, now), true);
let clock = now;
const watch = createAlertWatch({ alerts, registry, logger: pino({ level: "silent" }), ackTimeoutMs: 2000, everyMs: 0, now: () => clock });
const sensorRuntimes = [...registry.sensors()];

// Readings: every sensor once per round, temperatures moving around the frost limit.
const perReading: number[] = [];
for (let round = 0; round < 40; round++) {
  clock += 60_000;
  const started = performance.now();
  for (let i = 0; i < sensorRuntimes.length; i++) {
    const tempC = 1 + ((i + round) % 30) / 10;
    watch.reading(sensorRuntimes[i]!, { tempC, rh: 70 + (round % 30), battery: 0.5, atMs: clock }, clock);
  }
  perReading.push(((performance.now() - started) * 1000) / sensorRuntimes.length);
}

const passes: number[] = [];
for (let t = 0; t < 200; t++) {
  clock += 1000;
  const started = performance.now();
  watch.tick(clock);
  passes.push(performance.now() - started);
}

console.log(`alert rules, one reading: median ${median(perReading).toFixed(2)} µs (over ${sensorRuntimes.length} sensors × 40 rounds)`);
console.log(
  `alert rules, time-based pass over 10,000 plugs and 5,000 sensors (every 5 s by default): first ${passes[0]!.toFixed(2)} ms (every plug unheard since the start: 10,000 raised), then median ${median(passes.slice(1)).toFixed(2)} ms, max ${Math.max(...passes.slice(1)).toFixed(2)} ms`,
);
console.log(`alerts raised during the run: ${raised}`);
