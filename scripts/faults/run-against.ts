// Runs fault scenarios against a product that is already running (`npm start`), for
// working on a scenario without the suite's own stack:
//   npx tsx scripts/faults/run-against.ts [--url URL] [--mqtt URL] NAME…
// The URL and broker come from the arguments, else from PORT / CLOCHE_MQTT_PORT;
// the database from DATABASE_URL, else the running private MariaDB (CLOCHE_DB_PORT).
import path from "node:path";
import { runningDevDatabaseUrl } from "../local-server";
import { DEVICE_SECRETS_FILE } from "../demo-devices";
import type { FaultContext, FaultScenario } from "./scenario";
import { malformedPayloads } from "./scenarios/malformed-payloads";
import { staleReports } from "./scenarios/stale-reports";
import { sensorSilentAndClockOff } from "./scenarios/sensor-silent-and-clock-off";
import { overridesAtOnce } from "./scenarios/overrides-at-once";
import { secondSiteMember } from "./scenarios/second-site-member";

const SCENARIOS: FaultScenario[] = [malformedPayloads, staleReports, sensorSilentAndClockOff, overridesAtOnce, secondSiteMember];

function option(args: string[], name: string): string | undefined {
  const at = args.indexOf(name);
  if (at < 0) return undefined;
  const [value] = args.splice(at, 2).slice(1);
  if (!value) throw new Error(`${name} needs a value`);
  return value;
}

const args = process.argv.slice(2);
const url = option(args, "--url") ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`;
const mqttUrl = option(args, "--mqtt") ?? `mqtt://127.0.0.1:${process.env.CLOCHE_MQTT_PORT ?? 1883}`;
const databaseUrl = process.env.DATABASE_URL ?? runningDevDatabaseUrl();
if (!databaseUrl) {
  console.error("No DATABASE_URL and no running private MariaDB (.data/mariadb): start the product with npm start first.");
  process.exit(2);
}
const chosen = args.length === 0 || args.includes("all") ? SCENARIOS : args.map((name) => SCENARIOS.find((s) => s.name === name));
const unknown = args.filter((name, i) => name !== "all" && !chosen[i]);
if (unknown.length) {
  console.error(`Unknown scenario ${unknown.join(", ")}; known: ${SCENARIOS.map((s) => s.name).join(", ")}`);
  process.exit(2);
}

let failed = 0;
for (const scenario of chosen as FaultScenario[]) {
  const context: FaultContext = {
    url,
    mqttUrl,
    databaseUrl,
    deviceSecretsFile: process.env.CLOCHE_DEVICE_SECRETS ?? path.resolve(DEVICE_SECRETS_FILE),
    log: (line) => console.log(`  [${scenario.name}] ${line}`),
  };
  console.log(`▶ ${scenario.name}${scenario.quick ? " (quick)" : ""}: ${scenario.about}`);
  const started = Date.now();
  try {
    const result = await scenario.run(context);
    const seconds = ((Date.now() - started) / 1000).toFixed(1);
    console.log(`  figures: ${JSON.stringify(result.figures)}`);
    if (result.extra) console.log(`  extra:   ${JSON.stringify(result.extra)}`);
    if (result.failures.length) {
      failed++;
      for (const failure of result.failures) console.log(`  ✗ ${failure}`);
    }
    console.log(`${result.failures.length ? "✗ failed" : "✓ passed"} in ${seconds} s\n`);
  } catch (error) {
    failed++;
    console.log(`✗ ${scenario.name} could not run: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  }
}
process.exit(failed ? 1 : 0);
