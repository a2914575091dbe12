// The controller's MQTT figures, each beside the broker's own measured in the same run:
//   - reading → command → echoed report, one plug at a time among 1,000, against the
//     broker's QoS 1 round trip (command → echoed report from a plug the controller
//     does not run, through the same broker, interleaved with the first);
//   - a schedule edge that switches all 1,000 plugs, against a bare aedes broker
//     fanning one QoS 1 message out to 1,000 subscribers; beside both, the CPU time
//     each takes in the two processes, which bounds how fast it can be on this machine.
import net from "node:net";
import os from "node:os";
import { fork } from "node:child_process";
import { randomBytes, randomUUID } from "node:crypto";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { Aedes } from "aedes";
import mqtt, { type MqttClient } from "mqtt";
import pino from "pino";
import { and, eq, gte, inArray } from "drizzle-orm";
import { DateTime } from "luxon";
import { connect } from "../../db/client";
import { insertMany } from "../../db/bulk";
import { deviceCredentials, houses, plugs, scheduleWindows, schedules, sensors, sites, switchEvents } from "../../db/schema";
import { createController } from "../../controller/controller";
import { setNoDelay } from "../../fakes/connect";
import { CONTROLLER_USERNAME, deviceUsername } from "../../lib/mqtt/credentials";
import { hashDeviceSecret, newDeviceSecret } from "../../lib/server/device-secrets";
import { plugTopic, sensorTopic } from "../../lib/mqtt/topics";
import { clock, type FleetReply, type FleetRequest } from "./fleet";

const PLUGS = 1000;
const LATENCY_SAMPLES = 600;
const FANOUT_ROUNDS = 10;
const SITE = "bench-mqtt";
const ECHO_SITE = "bench-echo";
const here = path.dirname(fileURLToPath(import.meta.url));

function percentile(values: number[], p: number) {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}
const ms = (v: number) => `${v.toFixed(2)} ms`;

type BurstCpu = { broker: number; devices: number; total: number };
type BenchSite = { siteId: string; plugIds: string[]; scheduleIds: string[]; secrets: Map<string, string> };

async function createBenchSites(db: ReturnType<typeof connect>["db"]): Promise<BenchSite> {
  const siteId = randomUUID();
  const echoSiteId = randomUUID();
  const houseId = randomUUID();
  await db.insert(sites).values([
    { id: siteId, slug: SITE, name: "Bench", timeZone: "UTC", currency: "GBP" },
    { id: echoSiteId, slug: ECHO_SITE, name: "Bench echo", timeZone: "UTC", currency: "GBP" },
  ]);
  await db.insert(houses).values({ id: houseId, siteId, name: "Bench", kind: "other", lengthM: 50, widthM: 20, eaveHeightM: 3, ridgeHeightM: 5, glazing: "single_glass", highLimitC: 40 });
  const index = Array.from({ length: PLUGS }, (_, i) => i);
  const sensorIds = index.map(() => randomUUID());
  const plugIds = index.map(() => randomUUID());
  const scheduleIds = index.map(() => randomUUID());
  await insertMany(db, sensors, index.map((i) => ({ id: sensorIds[i]!, siteId, houseId, deviceId: `air-${i}`, name: `Air ${i}` })));
  await insertMany(
    db,
    plugs,
    index.map((i) => ({
      id: plugIds[i]!,
      siteId,
      houseId,
      deviceId: `heater-${i}`,
      name: `Heater ${i}`,
      applianceKind: "heater" as const,
      applianceWatts: 1000,
      ratedCurrentA: 13,
      sensorId: sensorIds[i]!,
      failsafe: "off" as const,
      outsideWindows: "off" as const,
      staleAfterS: 600,
      minOnS: 0,
      minOffS: 0,
      leaseS: 120,
    })),
  );
  await insertMany(db, schedules, index.map((i) => ({ id: scheduleIds[i]!, plugId: plugIds[i]!, name: "Bench" })));
  await setWindows(db, scheduleIds, { recurrence: "FREQ=DAILY", startsAt: "00:00:00", durationMin: 24 * 60, mode: "band", lowC: 10, highC: 12 });

  const secrets = new Map<string, string>();
  const credential = (site: string, id: string, kind: "plug" | "sensor", deviceId: string) => {
    const username = deviceUsername(site, kind, deviceId);
    const secret = newDeviceSecret();
    secrets.set(username, secret);
    return { siteId: id, deviceKind: kind, deviceId, username, secretHash: hashDeviceSecret(secret) };
  };
  await insertMany(db, deviceCredentials, [
    ...index.map((i) => credential(SITE, siteId, "plug", `heater-${i}`)),
    ...index.map((i) => credential(SITE, siteId, "sensor", `air-${i}`)),
    credential(ECHO_SITE, echoSiteId, "plug", "echo-1"),
  ]);
  return { siteId, plugIds, scheduleIds, secrets };
}

async function setWindows(
  db: ReturnType<typeof connect>["db"],
  scheduleIds: string[],
  window: Omit<typeof scheduleWindows.$inferInsert, "scheduleId">,
) {
  await db.delete(scheduleWindows).where(inArray(scheduleWindows.scheduleId, scheduleIds));
  await insertMany(db, scheduleWindows, scheduleIds.map((scheduleId) => ({ scheduleId, ...window })));
}

function startFleet() {
  const child = fork(path.join(here, "fleet.ts"), { execArgv: ["--import", "tsx"], stdio: ["inherit", "inherit", "inherit", "ipc"] });
  const waiters: ((reply: FleetReply) => boolean)[] = [];
  child.on("message", (reply: FleetReply) => {
    if (reply.kind === "error") throw new Error(`fleet: ${reply.message}`);
    const i = waiters.findIndex((w) => w(reply));
    if (i >= 0) waiters.splice(i, 1);
  });
  const request = <T extends FleetReply>(req: FleetRequest, match: (reply: FleetReply) => reply is T) =>
    new Promise<T>((resolve) => {
      waiters.push((reply) => (match(reply) ? (resolve(reply), true) : false));
      child.send(req);
    });
  return { child, request, expect: <T extends FleetReply>(match: (reply: FleetReply) => reply is T) => new Promise<T>((resolve) => waiters.push((reply) => (match(reply) ? (resolve(reply), true) : false))) };
}

async function connectClient(url: string, username?: string, password?: string): Promise<MqttClient> {
  const client = await mqtt.connectAsync(url, { protocolVersion: 4, username, password, clientId: `bench-${randomUUID().slice(0, 8)}`, reconnectPeriod: 0 });
  setNoDelay(client);
  return client;
}

/** Resolves when `device` reports a state carrying a command other than `previousCmd` with `on`. */
function reportWaiter(observer: MqttClient) {
  const waiting = new Map<string, { on: boolean; resolve: (at: number) => void; cmd?: string }>();
  observer.on("message", (topic, payload) => {
    const at = clock();
    const w = waiting.get(topic);
    if (!w) return;
    const report = JSON.parse(payload.toString()) as { on: boolean; cmd?: string };
    if (report.on === w.on && (w.cmd === undefined || report.cmd === w.cmd)) {
      waiting.delete(topic);
      w.resolve(at);
    }
  });
  return (topic: string, on: boolean, cmd?: string) =>
    new Promise<number>((resolve) => waiting.set(topic, { on, resolve, cmd }));
}

export async function mqttBench(databaseUrl: string) {
  const { db, pool } = connect(databaseUrl);
  const bench = await createBenchSites(db);
  const controllerSecret = randomBytes(24).toString("base64url");
  const controller = await createController({
    databaseUrl,
    controllerSecret,
    webappSecret: randomBytes(24).toString("base64url"),
    mqttPort: 0,
    sites: [SITE],
    logger: pino({ level: "silent" }),
  });
  const fleet = startFleet();
  const bare = await Aedes.createBroker();
  const bareServer = net.createServer({ noDelay: true }, bare.handle);
  await new Promise<void>((resolve) => bareServer.listen(0, "127.0.0.1", resolve));
  const bareUrl = `mqtt://127.0.0.1:${(bareServer.address() as net.AddressInfo).port}`;

  const sensorClients: MqttClient[] = [];
  let background: NodeJS.Timeout | undefined;
  try {
    const started = performance.now();
    await fleet.request(
      {
        kind: "plugs",
        url: controller.mqttUrl,
        site: SITE,
        plugs: Array.from({ length: PLUGS }, (_, i) => ({ device: `heater-${i}`, password: bench.secrets.get(deviceUsername(SITE, "plug", `heater-${i}`))! })),
      },
      (r): r is Extract<FleetReply, { kind: "ready" }> => r.kind === "ready" && r.what === "plugs",
    );
    await fleet.request(
      { kind: "plugs", url: controller.mqttUrl, site: ECHO_SITE, plugs: [{ device: "echo-1", password: bench.secrets.get(deviceUsername(ECHO_SITE, "plug", "echo-1"))! }] },
      (r): r is Extract<FleetReply, { kind: "ready" }> => r.kind === "ready" && r.what === "plugs",
    );
    await fleet.request(
      { kind: "subscribers", url: bareUrl, topic: "bench/fanout", count: PLUGS },
      (r): r is Extract<FleetReply, { kind: "ready" }> => r.kind === "ready" && r.what === "subscribers",
    );
    for (let i = 0; i < PLUGS; i += 50) {
      sensorClients.push(
        ...(await Promise.all(
          Array.from({ length: 50 }, (_, k) =>
            connectClient(controller.mqttUrl, deviceUsername(SITE, "sensor", `air-${i + k}`), bench.secrets.get(deviceUsername(SITE, "sensor", `air-${i + k}`))),
          ),
        )),
      );
    }
    // CPU time (µs) spent so far by this process (broker and controller) and by the devices' process.
    const cpuSpent = async () => {
      const { micros } = await fleet.request({ kind: "cpu" }, (r): r is Extract<FleetReply, { kind: "cpu" }> => r.kind === "cpu");
      const own = process.cpuUsage();
      return { broker: own.user + own.system, devices: micros };
    };
    const sleepUntil = (atMs: number) => new Promise((resolve) => setTimeout(resolve, Math.max(0, atMs - Date.now())));
    /** CPU ms a burst costs in each process: a second holding it less the quiet second before. */
    const burstCpu = async (startMs: number, burst: () => Promise<void>): Promise<BurstCpu> => {
      await sleepUntil(startMs - 1100);
      const c0 = await cpuSpent();
      await sleepUntil(startMs - 100);
      const c1 = await cpuSpent();
      await burst();
      await sleepUntil(startMs + 900);
      const c2 = await cpuSpent();
      const spent = (k: "broker" | "devices") => (c2[k] - c1[k] - (c1[k] - c0[k])) / 1000;
      return { broker: spent("broker"), devices: spent("devices"), total: spent("broker") + spent("devices") };
    };

    const observer = await connectClient(controller.mqttUrl, CONTROLLER_USERNAME, controllerSecret);
    const waitForReport = reportWaiter(observer);
    await observer.subscribeAsync(`cloche/v1/${SITE}/plug/+/report`, { qos: 1 });
    await observer.subscribeAsync(plugTopic(ECHO_SITE, "echo-1", "report"), { qos: 1 });
    console.log(`mqtt: ${PLUGS} plugs, ${PLUGS} sensors and ${PLUGS} bare subscribers connected in ${((performance.now() - started) / 1000).toFixed(1)} s`);

    // Every sensor reads 12.5 °C (above the band's high edge: off) every 5 s: 200 readings/s of load.
    const temps = new Array<number>(PLUGS).fill(12.5);
    const publishReading = (i: number, tempC: number) =>
      sensorClients[i]!.publishAsync(sensorTopic(SITE, `air-${i}`), JSON.stringify({ temp_c: tempC, at: new Date().toISOString() }), { qos: 1 });
    await Promise.all(temps.map((t, i) => publishReading(i, t)));
    let next = 0;
    background = setInterval(() => {
      for (let k = 0; k < 20; k++) {
        const i = next++ % PLUGS;
        void publishReading(i, temps[i]!).catch(() => undefined);
      }
    }, 100);
    // Let the controller settle every plug off (warm readings).
    await new Promise((resolve) => setTimeout(resolve, 4000));

    // 1. Reading → command → echo, interleaved with the broker's own round trip.
    const endToEnd: number[] = [];
    const roundTrip: number[] = [];
    let echoOn = false;
    for (let s = 0; s < LATENCY_SAMPLES; s++) {
      const i = s % (LATENCY_SAMPLES / 2);
      const on = s < LATENCY_SAMPLES / 2; // first pass switches plugs on, the second off
      temps[i] = on ? 8 : 12.5;
      const echoed = waitForReport(plugTopic(SITE, `heater-${i}`, "report"), on);
      const t0 = clock();
      await publishReading(i, temps[i]!);
      endToEnd.push((await echoed) - t0);

      echoOn = !echoOn;
      const id = randomUUID();
      const echo = waitForReport(plugTopic(ECHO_SITE, "echo-1", "report"), echoOn, id);
      const t1 = clock();
      await observer.publishAsync(plugTopic(ECHO_SITE, "echo-1", "command"), JSON.stringify({ id, on: echoOn, lease_s: 600 }), { qos: 1 });
      roundTrip.push((await echo) - t1);
    }
    const e2e99 = percentile(endToEnd, 99);
    const rt99 = percentile(roundTrip, 99);
    console.log(
      `reading → command → echo, 1 of ${PLUGS} plugs at a time (${LATENCY_SAMPLES} samples): p50 ${ms(percentile(endToEnd, 50))}, p99 ${ms(e2e99)}; ` +
        `broker's own QoS 1 round trip, same run: p50 ${ms(percentile(roundTrip, 50))}, p99 ${ms(rt99)}; ` +
        `p99 ratio ${(e2e99 / rt99).toFixed(2)}× (target ≤ 3×)`,
    );

    // 2. Fan-out. Quiet first: no background readings and no observer during either figure.
    clearInterval(background);
    background = undefined;
    await observer.unsubscribeAsync(`cloche/v1/${SITE}/plug/+/report`);
    const fanouts: number[] = [];
    const fanoutCpu: BurstCpu[] = [];
    const publisher = await connectClient(bareUrl);
    for (let round = 0; round < FANOUT_ROUNDS; round++) {
      const done = fleet.expect((r): r is Extract<FleetReply, { kind: "fanned-out" }> => r.kind === "fanned-out" && r.round === round);
      const startMs = Date.now() + 1200;
      fanoutCpu.push(
        await burstCpu(startMs, async () => {
          await sleepUntil(startMs);
          const t0 = clock();
          await publisher.publishAsync("bench/fanout", JSON.stringify({ round }), { qos: 1 });
          fanouts.push((await done).lastAt - t0);
        }),
      );
    }
    // The same, each subscriber answering with a retained QoS 1 message that one
    // subscriber inside the broker's process hears: an edge's traffic with no controller.
    const answered: number[] = [];
    const answers = { round: -1, heard: 0, done: (_at: number) => {} };
    const hearAnswer = (packet: { payload: Buffer | string }, cb: () => void) => {
      if ((JSON.parse(packet.payload.toString()) as { round: number }).round === answers.round && ++answers.heard === PLUGS) answers.done(clock());
      cb();
    };
    await new Promise<void>((resolve) => bare.subscribe("bench/fanout/answer/+", hearAnswer, resolve));
    for (let round = 0; round < FANOUT_ROUNDS; round++) {
      const heard = new Promise<number>((resolve) => Object.assign(answers, { round: FANOUT_ROUNDS + round, heard: 0, done: resolve }));
      const t0 = clock();
      await publisher.publishAsync("bench/fanout", JSON.stringify({ round: FANOUT_ROUNDS + round, answer: true }), { qos: 1 });
      answered.push((await heard) - t0);
      await new Promise((resolve) => setTimeout(resolve, 300));
    }
    await publisher.endAsync();

    // A one-minute "on" window for every plug, opening a few seconds from now: two
    // edges, each switching all 1,000 plugs at once.
    const opensMs = Math.ceil((Date.now() + 6000) / 1000) * 1000;
    const closesMs = opensMs + 60_000;
    await setWindows(db, bench.scheduleIds, {
      recurrence: "FREQ=DAILY",
      startsAt: DateTime.fromMillis(opensMs, { zone: "UTC" }).toFormat("HH:mm:ss"),
      durationMin: 1,
      mode: "on",
      lowC: null,
      highC: null,
    });
    await controller.reload();
    const edges: { label: string; atMs: number; toOn: boolean }[] = [
      { label: "opening", atMs: opensMs, toOn: true },
      { label: "closing", atMs: closesMs, toOn: false },
    ];
    const edgeFigures: string[] = [];
    const edgeTimes: number[] = [];
    const edgeCpu: BurstCpu[] = [];
    for (const edge of edges) {
      edgeCpu.push(await burstCpu(edge.atMs, async () => void (await sleepUntil(edge.atMs))));
      await sleepUntil(edge.atMs + 3000);
      const rows = await (async () => {
        for (;;) {
          await controller.flush();
          const found = await db
            .select({ at: switchEvents.at, ackAt: switchEvents.ackAt })
            .from(switchEvents)
            .where(and(inArray(switchEvents.plugId, bench.plugIds), gte(switchEvents.at, new Date(edge.atMs)), eq(switchEvents.toOn, edge.toOn)));
          if (found.length >= PLUGS && found.every((r) => r.ackAt)) return found;
          if (Date.now() > edge.atMs + 30_000) throw new Error(`only ${found.length} of ${PLUGS} plugs acknowledged the ${edge.label} edge`);
          await new Promise((resolve) => setTimeout(resolve, 250));
        }
      })();
      const lastAck = Math.max(...rows.map((r) => r.ackAt!.getTime()));
      const sent = rows.map((r) => r.at.getTime());
      edgeTimes.push(lastAck - edge.atMs);
      edgeFigures.push(
        `${edge.label} edge: commands sent ${Math.min(...sent) - edge.atMs}–${Math.max(...sent) - edge.atMs} ms after it, ` +
          `acknowledged: half by ${percentile(rows.map((r) => r.ackAt!.getTime() - edge.atMs), 50)} ms, 90 % by ${percentile(rows.map((r) => r.ackAt!.getTime() - edge.atMs), 90)} ms, all ${rows.length} by ${lastAck - edge.atMs} ms`,
      );
    }
    // Reference: the same 1,000 commands sent by a bare client straight after one another
    // (no controller), each plug echoing as it does for the controller.
    const bursts: number[] = [];
    await observer.subscribeAsync(`cloche/v1/${SITE}/plug/+/report`, { qos: 1 });
    await new Promise((resolve) => setTimeout(resolve, 1000));
    for (let round = 0; round < 3; round++) {
      const echoes = Array.from({ length: PLUGS }, (_, i) => {
        const id = randomUUID();
        return { i, id, echoed: waitForReport(plugTopic(SITE, `heater-${i}`, "report"), false, id) };
      });
      const t0 = clock();
      for (const e of echoes) observer.publish(plugTopic(SITE, `heater-${e.i}`, "command"), JSON.stringify({ id: e.id, on: false, lease_s: 120 }), { qos: 1 });
      const last = Math.max(...(await Promise.all(echoes.map((e) => e.echoed))));
      bursts.push(last - t0);
      await new Promise((resolve) => setTimeout(resolve, 500));
    }
    const fanout = percentile(fanouts, 50);
    const cpuFigure = (c: { broker: number; devices: number }) => `${c.broker.toFixed(0)} + ${c.devices.toFixed(0)} ms`;
    const medianFanoutCpu = [...fanoutCpu].sort((a, b) => a.total - b.total)[Math.floor(fanoutCpu.length / 2)]!;
    const answeredMedian = percentile(answered, 50);
    console.log(
      `schedule edge, ${PLUGS} plugs: ${edgeFigures.join("; ")}; bare broker fan-out of one QoS 1 message to ${PLUGS} subscribers, same run: ` +
        `median ${ms(fanout)} (of ${FANOUT_ROUNDS}, max ${ms(Math.max(...fanouts))}); worst edge ratio ${(Math.max(...edgeTimes) / fanout).toFixed(2)}× (target ≤ 1.5×)`,
    );
    console.log(
      `references for the edge: the bare fan-out with every subscriber answering (retained, QoS 1), heard in the broker's process: median ${ms(answeredMedian)} ` +
        `(${(answeredMedian / fanout).toFixed(2)}× the fan-out; worst edge ÷ this ${(Math.max(...edgeTimes) / answeredMedian).toFixed(2)}×); ` +
        `the same ${PLUGS} commands from a bare client to the controller's plugs, echoed: median ${ms(percentile(bursts, 50))} (of ${bursts.length})`,
    );
    // Both processes share this machine's cores, so a burst cannot finish much sooner
    // than its CPU time spread over all of them. The second counted after an edge also
    // holds its switch-log writes, which come after the last acknowledgement.
    const cores = os.availableParallelism();
    const spread = (c: BurstCpu) => `${ms(c.total / cores)} over ${cores} cores`;
    console.log(
      `CPU time in the second after a burst (less a quiet second), broker's process + devices' process: fan-out (median) ${cpuFigure(medianFanoutCpu)} ` +
        `(${spread(medianFanoutCpu)}); ` +
        edges.map((edge, i) => `${edge.label} edge ${cpuFigure(edgeCpu[i]!)} (${spread(edgeCpu[i]!)}; it took ${edgeTimes[i]} ms)`).join("; "),
    );
    await observer.endAsync();
  } finally {
    clearInterval(background);
    await Promise.all(sensorClients.map((c) => c.endAsync().catch(() => undefined)));
    fleet.child.send({ kind: "stop" } satisfies FleetRequest);
    await new Promise((resolve) => fleet.child.once("exit", resolve));
    await controller.close();
    await new Promise<void>((resolve) => bare.close(() => resolve()));
    bareServer.close();
    await pool.end();
  }
}
