// The database stops answering: frozen (SIGSTOP, a hung server or disk) or killed
// (SIGKILL) and started again. Control must not notice: a sensor signing in meanwhile is
// let in, a reading over a heater's high limit gets its "off" at once, a window that
// opens meanwhile switches its plug, and every switch made meanwhile is in the log
// afterwards, once each and in order. The web app answers 503 quickly, and recovers.
import type { MqttClient } from "mqtt";
import { sensorTopic } from "../../../lib/mqtt/topics";
import { timeToReach, journalOf } from "../accounting";
import { addOverride, cancelOverride, demoOwner, loadDemoSite, mqttConnect, sensorUsername, setGuard, setOnWindow, SITE, wakeSite } from "../demo";
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { wholeSecond, processesOf, secretOf, seconds, settle, sleep, waitFor } from "../steps";
import { probeWhile, signIn, timedGet } from "../web";

/**
 * A web answer slower than this while the database is away is a hang, not a fast
 * failure. The first request of an outage waits out one statement deadline (5 s, the
 * web app's CLOCHE_DB_TIMEOUT_MS); later ones are told at once.
 */
const WEB_ANSWER_LIMIT_MS = 6000;
/** Publish of the reading → the heater's plug obeying "off" (issue 14). */
const SAFETY_LIMIT_MS = 100;
/** How long a device's sign-in may take while the database is away. */
const SIGN_IN_LIMIT_MS = 5000;

type Outage = "freeze" | "kill";

export function databaseOutage(o: { name: string; quick: boolean; outage: Outage; seconds: number; option: string }): FaultScenario {
  const what = o.outage === "freeze" ? "frozen (SIGSTOP)" : "killed (SIGKILL) and started again";
  return {
    name: o.name,
    quick: o.quick,
    about: `MariaDB ${what} for ${o.seconds} s (--${o.option}): sign-in, safety cut-out, a window opening, the switch log and the web app meanwhile.`,
    run: (context) => runOutage(context, o.outage, context.options?.[o.option] ?? o.seconds),
  };
}

async function runOutage(context: FaultContext, outage: Outage, outageS: number): Promise<FaultResult> {
  const { log, url, mqttUrl, databaseUrl } = context;
  const processes = processesOf(context);
  const fromMs = Date.now();
  const failures: string[] = [];
  const extra: Record<string, number | string> = { "outage s": outageS };
  const site = await loadDemoSite(databaseUrl);
  const heater = site.plug("glass-heater");
  const fan = site.plug(processes.plug.device);
  const sensorDevice = site.sensorDevice(heater.sensorId!);
  const sensorSecret = await secretOf(context, sensorUsername(sensorDevice));
  const cookie = await signIn(url, demoOwner().email, demoOwner().password);

  log(`the glasshouse heater is switched on by an override, with short minimum on/off times`);
  await setGuard(databaseUrl, heater, 10);
  const overrideId = await addOverride(databaseUrl, heater, true, 30);
  await wakeSite(mqttUrl, processes.env, { reason: "override", plug: heater.deviceId });
  const heaterOn = await waitFor(() => journalOf(processes.journalFile).findLast((e) => e.device === heater.deviceId)?.on === true, 30_000, 200);
  if (!heaterOn) failures.push("the heater did not come on for its override before the outage");

  const sensor: MqttClient = await mqttConnect(mqttUrl, sensorUsername(sensorDevice), sensorSecret, 10_000);
  const edgeMs = wholeSecond(Date.now() + 20_000);
  const outageAtMs = edgeMs - 5000;
  log(`${fan.deviceId} gets a window opening at ${new Date(edgeMs).toISOString()}, 5 s into the outage`);
  await setOnWindow(databaseUrl, site, fan, edgeMs, 10);
  await wakeSite(mqttUrl, processes.env, { reason: "schedule", plug: fan.deviceId });
  await sleep(outageAtMs - Date.now());

  let over = false;
  let probes: Promise<Awaited<ReturnType<typeof probeWhile>>> = Promise.resolve([]);
  try {
    if (outage === "freeze") {
      processes.database.freeze();
      log(`MariaDB frozen (pid ${processes.database.pid()}) for ${outageS} s`);
    } else {
      await processes.database.kill();
      log(`MariaDB killed; it is started again in ${outageS} s`);
    }
    const liveUrl = `/api/sites/${site.id}/live`;
    probes = probeWhile(url, [`/sites/${SITE}`, liveUrl], cookie, { everyMs: 1000, timeoutMs: 30_000, until: () => over });

    await sleep(1000);
    const hotC = site.houseHighLimitC(heater.houseId) + 8;
    const publishedMs = Date.now();
    await sensor.publishAsync(sensorTopic(SITE, sensorDevice), JSON.stringify({ temp_c: hotC, rh: 60, battery: 0.9, at: new Date(publishedMs).toISOString() }), { qos: 1 });
    log(`reading of ${hotC} °C published for ${sensorDevice} (high limit ${hotC - 8} °C)`);
    const off = await waitFor(() => journalOf(processes.journalFile).find((e) => e.device === heater.deviceId && e.atMs >= publishedMs && !e.on), 3000);
    if (!off) failures.push("the heater got no \"off\" within 3 s of a reading over its high limit");
    else {
      const latency = off.atMs - publishedMs;
      extra["safety off ms"] = latency;
      log(`the heater obeyed "off" ${latency} ms after the reading was published`);
      if (latency > SAFETY_LIMIT_MS) failures.push(`the heater's "off" took ${latency} ms (target ${SAFETY_LIMIT_MS} ms)`);
    }

    const signInFrom = Date.now();
    try {
      const late = await mqttConnect(mqttUrl, sensorUsername(sensorDevice), sensorSecret, SIGN_IN_LIMIT_MS);
      extra["sign-in ms"] = Date.now() - signInFrom;
      log(`a sensor signed in during the outage in ${Date.now() - signInFrom} ms`);
      late.end(true);
    } catch (error) {
      extra["sign-in ms"] = "refused";
      failures.push(`a sensor connecting during the outage was not signed in within ${SIGN_IN_LIMIT_MS} ms (${(error as Error).message})`);
      log(`a sensor connecting during the outage was not signed in: ${(error as Error).message}`);
    }

    await sleep(outageAtMs + outageS * 1000 - Date.now());
  } finally {
    if (outage === "freeze") processes.database.thaw();
    else await processes.database.restart();
    over = true;
    log(outage === "freeze" ? "MariaDB thawed (SIGCONT)" : "MariaDB started again");
  }
  const answers = await probes;
  sensor.end(true);

  const slowest = answers.reduce((max, a) => Math.max(max, a.ms), 0);
  const statuses = [...new Set(answers.map((a) => `${a.path.startsWith("/api") ? "live" : "page"} ${a.status}`))].join(", ");
  extra["web answers"] = answers.length;
  extra["slowest web ms"] = slowest;
  extra["web statuses"] = statuses;
  log(`web app during the outage: ${answers.length} answers, slowest ${slowest} ms (${statuses})`);
  const hung = answers.filter((a) => a.ms > WEB_ANSWER_LIMIT_MS || a.status === "no answer");
  if (hung.length) failures.push(`${hung.length} web answer(s) during the outage took over ${seconds(WEB_ANSWER_LIMIT_MS)} (slowest ${seconds(slowest)})`);
  const unclear = answers.filter((a) => a.status !== 503 && a.status !== "no answer" && (typeof a.status !== "number" || a.status >= 500));
  if (unclear.length) failures.push(`${unclear.length} web answer(s) during the outage were ${[...new Set(unclear.map((a) => a.status))].join("/")}, not a clear 503`);

  log("waiting for the web app and the controller to catch up…");
  const recovered = await waitFor(async () => (await timedGet(`${url}/api/sites/${site.id}/live`, cookie, 10_000)).status === 200, 60_000, 1000);
  if (!recovered) failures.push("/api/sites/:id/live did not answer 200 within 60 s after the outage");
  const page = await timedGet(`${url}/sites/${SITE}`, cookie, 30_000);
  if (page.status !== 200) failures.push(`the site's page answered ${page.status} after the outage`);
  await cancelOverride(databaseUrl, overrideId);
  await wakeSite(mqttUrl, processes.env, { reason: "override", plug: heater.deviceId });
  await sleep(5000);

  const journal = journalOf(processes.journalFile);
  // Requests during an outage are not bad input: their answers are judged above, and the
  // 5xx figure (bad input only) does not apply.
  return settle(context, { fromMs, gaps: { "window opening": timeToReach(journal, fan.deviceId, true, edgeMs) }, failures, extra });
}
