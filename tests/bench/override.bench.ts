// `npm run bench:override`: a phone's override press → the plug's own report shown as
// confirmed on the page, through the real stack (not a test: it prints figures).
//
//   its own MariaDB (scripts/local-server.ts) → the built web app under `next start`
//   (built first when its sources changed) → the controller with its embedded broker →
//   a simulated plug (fakes/plug-device.ts) → the web app's MQTT subscription → the
//   page's server-sent events, read here as a browser's EventSource would.
//
// 100 presses (after 5 uncounted warm-up presses), alternating on and off, on a heater with minimum on/off times of 0.
// Legs, each timed in this process on one clock by a watcher on the broker (signed in
// as the controller, which may read every topic):
//   POST answered   press → the handler's answer (write, audit, wake-up published)
//   wake → command  the wake-up on the broker → the controller's command to the plug
//   command → report the command → the plug's report of its new state
//   report → SSE    that report on the broker → the event on the page's stream
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import os from "node:os";
import pino from "pino";
import { bin, root, run, waitForHttp } from "../../scripts/common";
import { buildIsCurrent, markBuilt, sourceHash } from "../../scripts/build-stamp";
import { TEST_DATABASE_FOLDER, freePort, startLocalDatabase } from "../../scripts/local-server";
import { migrateDatabase } from "../../db/migrate";
import { connect } from "../../db/client";
import { memberships } from "../../db/schema";
import { createController } from "../../controller/controller";
import { CONTROLLER_USERNAME } from "../../lib/mqtt/credentials";
import { plugTopic, wakeTopic } from "../../lib/mqtt/topics";
import { connectAs, createControlSite, startTestHeater } from "../support/control-site";
import { sseReader } from "../support/sse";

const PRESSES = 100;
/** Presses first, not counted: `next start` loads each route's code on its first request. */
const WARM_UP = 5;
const BUDGET_MS = 500;

function percentile(values: number[], p: number) {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

const say = (line: string) => console.log(`[bench:override] ${line}`);

const database = await startLocalDatabase({ folder: TEST_DATABASE_FOLDER, port: 0, database: "cloche_bench_override", fresh: true, log: () => {} });
let web: ChildProcess | undefined;
const closers: (() => Promise<unknown>)[] = [];
try {
  await migrateDatabase(database.url);
  process.env.DATABASE_URL = database.url;
  const { db, pool } = connect(database.url);
  closers.push(() => pool.end());
  const site = await createControlSite(db, { minOnS: 0, minOffS: 0, staleAfterS: 3600, failsafe: "off" });

  const controllerSecret = randomBytes(24).toString("base64url");
  const webappSecret = randomBytes(24).toString("base64url");
  const controller = await createController({
    databaseUrl: database.url,
    controllerSecret,
    webappSecret,
    mqttPort: 0,
    sites: [site.slug],
    logger: pino({ level: "silent" }),
  });
  closers.unshift(() => controller.close());
  const heater = await startTestHeater(site, controller.mqttUrl);
  closers.unshift(() => heater.close());

  const hash = sourceHash();
  if (!buildIsCurrent(hash)) {
    say("building the web app (next build)…");
    const code = await run(bin("next"), ["build"], { ...process.env, NODE_ENV: "production" });
    if (code !== 0) throw new Error("next build failed");
    markBuilt(hash);
  }
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  web = spawn(bin("next"), ["start", "--hostname", "127.0.0.1", "--port", String(port)], {
    cwd: root,
    env: {
      ...process.env,
      NODE_ENV: "production",
      DATABASE_URL: database.url,
      BETTER_AUTH_URL: base,
      BETTER_AUTH_SECRET: randomBytes(32).toString("base64url"),
      CLOCHE_MQTT_URL: controller.mqttUrl,
      CLOCHE_MQTT_WEBAPP_SECRET: webappSecret,
    },
    stdio: ["ignore", "ignore", "inherit"],
    detached: true,
  });
  let webAlive = true;
  web.on("exit", () => (webAlive = false));
  if (!(await waitForHttp(`${base}/api/health`, 60_000, () => webAlive))) throw new Error("next start did not answer within 60 s");
  say(`web app under next start at ${base}; controller broker at ${controller.mqttUrl}`);

  // A helper of the site, signed in through the web app.
  const email = `bench-${randomBytes(4).toString("hex")}@bench.example`;
  const signUp = await fetch(`${base}/api/auth/sign-up/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: base },
    body: JSON.stringify({ email, password: "bench-override-password", name: "Bench helper" }),
  });
  if (!signUp.ok) throw new Error(`sign-up failed: ${signUp.status} ${await signUp.text()}`);
  const cookie = signUp.headers
    .getSetCookie()
    .map((c) => c.split(";")[0]!)
    .join("; ");
  const { user } = (await signUp.json()) as { user: { id: string } };
  await db.insert(memberships).values({ siteId: site.siteId, userId: user.id, role: "helper" });

  // The watcher on the broker.
  const watcher = await connectAs(controller.mqttUrl, CONTROLLER_USERNAME, controllerSecret);
  closers.unshift(() => watcher.endAsync());
  const seen: Record<string, number[]> = { wake: [], command: [], report: [] };
  const topics = {
    [wakeTopic(site.slug)]: "wake",
    [plugTopic(site.slug, "heater-1", "command")]: "command",
    [plugTopic(site.slug, "heater-1", "report")]: "report",
  };
  watcher.on("message", (topic) => seen[topics[topic]!]?.push(performance.now()));
  await watcher.subscribeAsync(Object.keys(topics), { qos: 0 });

  const plugPath = `${base}/api/sites/${site.siteId}/plugs/${site.heaterId}`;
  const abort = new AbortController();
  const stream = await fetch(`${plugPath}/events`, { headers: { cookie, accept: "text/event-stream" }, signal: abort.signal });
  if (!stream.ok) throw new Error(`events: ${stream.status}`);
  closers.unshift(async () => abort.abort());
  const events = sseReader(stream.body!);
  const hello = await events.next((e) => e.event === "hello");
  if (!(hello.data as { live: boolean }).live) throw new Error("the web app's subscription is not live");

  const legs = { total: [] as number[], post: [] as number[], wakeToCommand: [] as number[], commandToReport: [] as number[], reportToSse: [] as number[] };
  let on = !heater.on;
  for (let i = -WARM_UP; i < PRESSES; i++) {
    const mark = { wake: seen.wake!.length, command: seen.command!.length, report: seen.report!.length };
    const started = performance.now();
    const response = await fetch(`${plugPath}/overrides`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: base, cookie },
      body: JSON.stringify({ on, duration: "30m", reason: `bench press ${i + 1}` }),
    });
    const answered = performance.now();
    if (response.status !== 201) throw new Error(`press ${i + 1}: ${response.status} ${await response.text()}`);
    const confirmed = await events.next((e) => e.event === "report" && (e.data as { on: boolean }).on === on, 5000);
    on = !on;
    if (i < 0) continue;
    const wakeAt = seen.wake![mark.wake];
    const commandAt = seen.command![mark.command];
    const reportAt = seen.report![mark.report];
    legs.total.push(confirmed.at - started);
    legs.post.push(answered - started);
    if (wakeAt !== undefined && commandAt !== undefined) legs.wakeToCommand.push(commandAt - wakeAt);
    if (commandAt !== undefined && reportAt !== undefined) legs.commandToReport.push(reportAt - commandAt);
    if (reportAt !== undefined) legs.reportToSse.push(confirmed.at - reportAt);
  }

  const row = (name: string, values: number[]) =>
    `  ${name.padEnd(36)} p50 ${percentile(values, 50).toFixed(1).padStart(7)} ms   p99 ${percentile(values, 99).toFixed(1).padStart(7)} ms   (n=${values.length}; budget ${BUDGET_MS} ms for the whole press)`;
  console.log(`\nOverride press → confirmed on the page, ${PRESSES} presses (web app under next start, controller, embedded broker, simulated plug)`);
  console.log(row("press → confirmed (SSE event)", legs.total));
  console.log(row("  POST answered", legs.post));
  console.log(row("  wake → command published", legs.wakeToCommand));
  console.log(row("  command → plug report", legs.commandToReport));
  console.log(row("  report → SSE event", legs.reportToSse));
  console.log(`  slowest press ${Math.max(...legs.total).toFixed(1)} ms; load average ${os.loadavg().map((l) => l.toFixed(1)).join(" ")} on ${os.cpus().length} cores`);
  console.log(`  p99 ${percentile(legs.total, 99) < BUDGET_MS ? "within" : "OVER"} the ${BUDGET_MS} ms budget\n`);
} finally {
  if (web?.pid) {
    try {
      process.kill(-web.pid, "SIGTERM");
    } catch {
      // already gone
    }
  }
  for (const close of closers) await close().catch(() => {});
  await database.stop();
}
