// `npm run faults`: the fault suite. A stack of its own — a fresh private MariaDB in
// .data/mariadb-faults, migrations and the demo, the controller with its broker, the
// simulated devices (one plug in a process of its own), the mail sink and the built
// web app, on free ports — then each scenario (scripts/faults/scenarios/index.ts) in
// turn, its figures, and one table at the end. Exits 1 when any target is missed.
//
//   npm run faults                         every scenario
//   npm run faults -- --quick              the quick ones (also run by npm test)
//   npm run faults -- NAME…                the named ones
//   npm run faults -- --freeze-seconds 60  options taken by scenarios (see --help)
import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { LocalDatabaseError, freePort, startLocalDatabase, type LocalDatabase } from "./local-server";
import { dataFolder, say } from "./common";
import { startStack, type Stack } from "./stack";
import { faultDatabase, standalonePlug, type FaultProcesses, type StandalonePlug } from "./faults/processes";
import { scenarios } from "./faults/scenarios";
import type { FaultResult, FaultScenario } from "./faults/scenario";

const FOLDER = path.join(dataFolder, "mariadb-faults");
const WORK = path.join(dataFolder, "faults");
/** The demo plug run in a process of its own, so that it can lose its power. */
const OWN_PROCESS_PLUG = "glass-fan";
const OPTIONS = ["freeze-seconds", "brief-freeze-seconds", "down-seconds"];

function parseArgs(argv: string[]) {
  const names: string[] = [];
  const options: Record<string, number> = {};
  let quick = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (arg === "--quick") quick = true;
    else if (arg === "--help") {
      console.log(`usage: npm run faults -- [--quick] [${OPTIONS.map((o) => `--${o} N`).join("] [")}] [NAME…]\n\nscenarios:`);
      for (const s of scenarios) console.log(`  ${s.name}${s.quick ? " (quick)" : ""}: ${s.about}`);
      process.exit(0);
    } else if (arg.startsWith("--")) {
      const name = arg.slice(2);
      const value = Number(argv[++i]);
      if (!OPTIONS.includes(name)) throw new LocalDatabaseError(`unknown option ${arg}; try --help`);
      if (!Number.isInteger(value) || value < 1 || value > 3600) throw new LocalDatabaseError(`${arg} takes whole seconds from 1 to 3600`);
      options[name] = value;
    } else names.push(arg);
  }
  const unknown = names.filter((n) => !scenarios.some((s) => s.name === n));
  if (unknown.length) throw new LocalDatabaseError(`no scenario named ${unknown.join(", ")}; there are: ${scenarios.map((s) => s.name).join(", ")}`);
  const chosen = scenarios.filter((s) => (names.length ? names.includes(s.name) : !quick || s.quick));
  return { chosen, options };
}

type Row = { name: string; ms: number; result: FaultResult };

const TARGETS: [keyof FaultResult["figures"], string][] = [
  ["switchesLost", "switch(es) lost"],
  ["switchesDoubled", "switch(es) doubled"],
  ["crashes", "process crash(es)"],
  ["serverErrors", "5xx answer(s) to bad input"],
];

/** The targets, applied to every scenario's figures whatever it checked itself. */
function missedTargets(result: FaultResult) {
  return TARGETS.flatMap(([key, words]) => {
    const value = result.figures[key];
    return value !== null && value > 0 ? [`${value} ${words} (target 0)`] : [];
  });
}

function printTable(rows: Row[]) {
  const cell = (v: number | null) => (v === null ? "–" : String(v));
  const lines = [
    ["scenario", "duration", "lost", "doubled", "longest gap", "crashes", "5xx", "result"],
    ...rows.map(({ name, ms, result: { figures: f, failures } }) => [
      name,
      `${(ms / 1000).toFixed(1)} s`,
      cell(f.switchesLost),
      cell(f.switchesDoubled),
      f.longestControlGapMs === null ? "–" : `${f.longestControlGapMs} ms`,
      cell(f.crashes),
      cell(f.serverErrors),
      failures.length ? "FAIL" : "pass",
    ]),
  ];
  const widths = lines[0]!.map((_, i) => Math.max(...lines.map((l) => l[i]!.length)));
  console.log("");
  for (const [n, line] of lines.entries()) {
    console.log("  " + line.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  "));
    if (n === 0) console.log("  " + widths.map((w) => "─".repeat(w)).join("  "));
  }
  console.log("");
}

let database: LocalDatabase | undefined;
let processes: FaultProcesses | undefined;
let stack: Stack | undefined;
let plug: StandalonePlug | undefined;

async function main(): Promise<number> {
  const { chosen, options } = parseArgs(process.argv.slice(2));
  const began = Date.now();
  say(`fault suite: ${chosen.map((s) => s.name).join(", ")}`);
  rmSync(FOLDER, { recursive: true, force: true });
  rmSync(WORK, { recursive: true, force: true });
  mkdirSync(WORK, { recursive: true });
  const journalFile = path.join(WORK, "plug-journal.jsonl");
  const deviceSecretsFile = path.join(WORK, "device-secrets.json");

  const log = (line: string) => console.log(`[mariadb] ${line}`);
  database = await startLocalDatabase({ folder: FOLDER, port: 0, database: "cloche", fresh: true, log });
  const host = "127.0.0.1";
  const port = await freePort();
  const url = `http://${host}:${port}`;
  stack = await startStack({
    databaseUrl: database.url,
    host,
    port,
    mqttPort: await freePort(),
    smtpPort: await freePort(),
    mailFolder: mkdtempSync(path.join(tmpdir(), "cloche-faults-mail-")),
    historyDays: 0,
    deviceSecretsFile,
    env: {
      BETTER_AUTH_URL: url,
      CLOCHE_SIGN_IN_LIMIT: "100",
      CLOCHE_PLUG_JOURNAL: journalFile,
      CLOCHE_FAKES_EXCEPT: OWN_PROCESS_PLUG,
      LOG_LEVEL: process.env.LOG_LEVEL ?? "error",
      // The scenarios send thousands of bad messages to test the controller, not the
      // broker's per-device limits (tests/integration/device-flood.test.ts tests those):
      // a device is held back only far above what they send.
      CLOCHE_DEVICE_BURST: "5000",
      CLOCHE_DEVICE_PER_SECOND: "2000",
    },
  });
  plug = standalonePlug({ device: OWN_PROCESS_PLUG, env: { ...stack.env, MQTT_URL: stack.mqttUrl }, log: say });
  await plug.start();

  const expected = new Map<string, number>();
  const services = stack.services;
  processes = {
    database: faultDatabase(database, { folder: FOLDER, database: "cloche", log }),
    service(name) {
      const found = services.find((s) => s.name === name);
      if (!found) throw new Error(`no service ${name}`);
      return found;
    },
    plug,
    journalFile,
    env: stack.env,
    expectStop: (name) => expected.set(name, (expected.get(name) ?? 0) + 1),
  };
  say(`stack ready in ${((Date.now() - began) / 1000).toFixed(1)} s at ${url}`);
  // The devices sign in and the controller takes its first decisions.
  await new Promise((resolve) => setTimeout(resolve, 5000));

  const rows: Row[] = [];
  for (const scenario of chosen) rows.push(await runScenario(scenario, { url, options, deviceSecretsFile, expected }));
  printTable(rows);
  const failed = rows.filter((r) => r.result.failures.length);
  say(failed.length ? `${failed.length} of ${rows.length} scenario(s) missed a target: ${failed.map((r) => r.name).join(", ")}` : `all ${rows.length} scenario(s) met their targets`);
  say(`fault suite took ${((Date.now() - began) / 1000).toFixed(1)} s`);
  return failed.length ? 1 : 0;
}

async function runScenario(scenario: FaultScenario, o: { url: string; options: Record<string, number>; deviceSecretsFile: string; expected: Map<string, number> }): Promise<Row> {
  console.log(`\n── ${scenario.name}: ${scenario.about}`);
  const log = (line: string) => console.log(`   ${scenario.name} · ${line}`);
  const deathsBefore = new Map(stack!.services.map((s) => [s.name, s.deaths]));
  const plugCrashesBefore = plug!.crashes;
  o.expected.clear();
  const began = Date.now();
  let result: FaultResult;
  try {
    result = await scenario.run({
      url: o.url,
      mqttUrl: stack!.mqttUrl,
      databaseUrl: database!.url,
      deviceSecretsFile: o.deviceSecretsFile,
      log,
      processes,
      options: o.options,
    });
  } catch (error) {
    log(`stopped by an error: ${(error as Error).stack ?? error}`);
    result = {
      figures: { switchesLost: null, switchesDoubled: null, longestControlGapMs: null, crashes: null, serverErrors: null },
      failures: [`the scenario could not run to its end: ${(error as Error).message}`],
    };
  }
  const ms = Date.now() - began;
  // A crash: a service stopping without the scenario having stopped it.
  let crashes = plug!.crashes - plugCrashesBefore;
  for (const service of stack!.services) {
    const deaths = service.deaths - (deathsBefore.get(service.name) ?? 0);
    const extra = deaths - (o.expected.get(service.name) ?? 0);
    if (extra > 0) {
      crashes += extra;
      log(`${service.name} stopped unexpectedly ${extra} time(s)`);
    }
    if (service.state === "given-up") result.failures.push(`the supervisor gave up on ${service.name}`);
  }
  result.figures.crashes = Math.max(result.figures.crashes ?? 0, crashes);
  result.failures = [...new Set([...result.failures, ...missedTargets(result)])];

  const f = result.figures;
  const figure = (v: number | null, unit = "") => (v === null ? "–" : `${v}${unit}`);
  log(
    `figures: lost ${figure(f.switchesLost)}, doubled ${figure(f.switchesDoubled)}, longest control gap ${figure(f.longestControlGapMs, " ms")}, ` +
      `crashes ${figure(f.crashes)}, 5xx ${figure(f.serverErrors)}`,
  );
  if (result.extra) log(Object.entries(result.extra).map(([k, v]) => `${k} ${v}`).join(", "));
  for (const failure of result.failures) log(`MISSED: ${failure}`);
  log(`${result.failures.length ? "FAIL" : "pass"} in ${(ms / 1000).toFixed(1)} s`);
  return { name: scenario.name, ms, result };
}

let finished = false;
async function finish(code: number) {
  if (finished) return;
  finished = true;
  // A scenario stopped half-way may have left the database frozen.
  const pid = processes?.database.pid();
  if (pid) process.kill(pid, "SIGCONT");
  await plug?.stop();
  await stack?.stop();
  await (processes?.database ?? database)?.stop();
  process.exit(code);
}
process.on("SIGINT", () => void finish(130));
process.on("SIGTERM", () => void finish(143));

main()
  .then(finish)
  .catch((error) => {
    console.error(`[cloche] ${error instanceof LocalDatabaseError ? error.message : error?.stack ?? error}`);
    void finish(1);
  });
