// 10,000 malformed payloads from signed-in devices on their own topics: a scenario
// sensor and heater (so the readings table can be checked to the row) and the demo's
// own sensor and plug. The controller must stay up, store nothing from them, and still
// switch the heater on the next good reading.
import { sensorTopic, plugTopic } from "../../../lib/mqtt/topics";
import type { FaultContext, FaultResult, FaultScenario } from "../scenario";
import { watchController } from "../support/controller-watch";
import { lastSwitchId, loadSite, openDb, readingsCount, switchesAfter } from "../support/db";
import {
  closeDevice,
  connectDevice,
  demoSecret,
  publishReading,
  sleep,
  startScenarioPlug,
  waitFor,
  type DeviceLink,
} from "../support/devices";
import { malformedPayload, type Channel } from "../support/malformed";
import { makeScenarioHouse } from "../support/scenario-house";

const TOTAL = 10_000;
/** Messages in flight per device at once: paced, so a broker limit slows rather than cuts. */
const IN_FLIGHT = 50;
const ACK_WAIT_MS = 15_000;

type Stream = { link: DeviceLink; topic: string; channel: Channel; count: number; label: string };

async function flood(stream: Stream, tally: { delivered: number; heldBack: number; kinds: Set<string> }) {
  let next = 0;
  async function worker() {
    while (next < stream.count) {
      const i = next++;
      const { kind, payload } = malformedPayload(stream.channel, i);
      tally.kinds.add(`${stream.channel}: ${kind}`);
      const sent = stream.link.client.publishAsync(stream.topic, payload, { qos: 1, retain: false });
      const timeout = sleep(ACK_WAIT_MS).then(() => "timeout" as const);
      const outcome = await Promise.race([sent.then(() => "acked" as const, () => "failed" as const), timeout]);
      if (outcome === "acked") tally.delivered++;
      else tally.heldBack++;
    }
  }
  await Promise.all(Array.from({ length: IN_FLIGHT }, worker));
}

async function run(context: FaultContext): Promise<FaultResult> {
  const failures: string[] = [];
  const db = openDb(context.databaseUrl);
  const demo = await loadSite(db);
  const house = await makeScenarioHouse(context, demo, "junk", { frostLowC: 8, frostHighC: 10 });
  const links: DeviceLink[] = [];
  try {
    const demoPlug = demo.plugs.find((p) => p.applianceKind === "heater" && p.sensorId) ?? demo.plugs[0]!;
    const demoSensor = demo.sensors.find((s) => s.id === demoPlug.sensorId) ?? demo.sensors[0]!;
    const plug = await startScenarioPlug(context.mqttUrl, { site: house.site, device: house.plug.deviceId, secret: house.plug.secret });
    const sensor = await connectDevice(context.mqttUrl, { site: house.site, kind: "sensor", device: house.sensor.deviceId, secret: house.sensor.secret });
    links.push(plug.link, sensor);

    // A warm reading first, so the heater is known off and the cold one afterwards must switch it.
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 15, at: new Date() });
    const readyCount = await waitFor(async () => {
      const n = await readingsCount(db, house.sensor.id);
      return n >= 1 ? n : null;
    }, 15_000);
    if (readyCount === null) throw new Error("the scenario sensor's first reading was not stored within 15 s");
    context.log(`scenario house ready: sensor ${house.sensor.deviceId} heard, heater ${house.plug.deviceId} off`);

    const demoSensorLink = await connectDevice(context.mqttUrl, { site: demo.slug, kind: "sensor", device: demoSensor.deviceId, secret: demoSecret(context, demo.slug, "sensor", demoSensor.deviceId) });
    const demoPlugLink = await connectDevice(context.mqttUrl, { site: demo.slug, kind: "plug", device: demoPlug.deviceId, secret: demoSecret(context, demo.slug, "plug", demoPlug.deviceId) });
    links.push(demoSensorLink, demoPlugLink);

    const streams: Stream[] = [
      { link: sensor, topic: sensorTopic(house.site, house.sensor.deviceId), channel: "reading", count: 4000, label: "scenario sensor" },
      { link: plug.link, topic: plugTopic(house.site, house.plug.deviceId, "report"), channel: "report", count: 3000, label: "scenario heater, report" },
      { link: plug.link, topic: plugTopic(house.site, house.plug.deviceId, "presence"), channel: "presence", count: 500, label: "scenario heater, presence" },
      { link: demoSensorLink, topic: sensorTopic(demo.slug, demoSensor.deviceId), channel: "reading", count: 1500, label: `demo sensor ${demoSensor.deviceId}` },
      { link: demoPlugLink, topic: plugTopic(demo.slug, demoPlug.deviceId, "report"), channel: "report", count: 1000, label: `demo plug ${demoPlug.deviceId}` },
    ];
    if (streams.reduce((n, s) => n + s.count, 0) !== TOTAL) throw new Error("the streams do not add up to the total");

    const beforeCount = await readingsCount(db, house.sensor.id);
    const firstSwitchId = await lastSwitchId(db);
    const watch = await watchController(db);
    const tally = { delivered: 0, heldBack: 0, kinds: new Set<string>() };
    const started = Date.now();
    context.log(`sending ${TOTAL} malformed payloads (${streams.map((s) => `${s.count} as ${s.label}`).join(", ")}), ${IN_FLIGHT} in flight per device`);
    await Promise.all(streams.map((s) => flood(s, tally)));
    const floodMs = Date.now() - started;
    const disconnects = links.reduce((n, l) => n + l.disconnects, 0);
    context.log(`sent in ${(floodMs / 1000).toFixed(1)} s: ${tally.delivered} delivered, ${tally.heldBack} held back, ${disconnects} disconnects, ${tally.kinds.size} kinds`);

    // Anything wrongly accepted would be stored within the readings store's flush.
    await sleep(3000);
    const afterCount = await readingsCount(db, house.sensor.id);
    if (afterCount !== beforeCount) failures.push(`${afterCount - beforeCount} readings were stored from malformed payloads`);
    const watched = await watch.stop();
    if (watched.crashes > 0) failures.push(`the controller stopped or restarted (${watched.instances} instances seen, beating: ${watched.beating})`);

    // A good reading after all that still drives the heater.
    for (const link of [sensor, plug.link]) if (!link.client.connected) await waitFor(async () => link.client.connected, 15_000);
    const goodAt = Date.now();
    await publishReading(sensor, house.site, house.sensor.deviceId, { temp_c: 5, at: new Date() });
    const switched = await waitFor(async () => {
      const rows = await switchesAfter(db, [house.plug.id], firstSwitchId);
      return rows.find((r) => r.toOn && r.ackAt) ?? null;
    }, 15_000);
    const reactionMs = switched ? switched.at.getTime() - goodAt : null;
    if (!switched) failures.push("a good cold reading after the flood did not switch the heater on within 15 s");
    else context.log(`good reading of 5 °C after the flood: heater on ${reactionMs} ms later, confirmed`);
    const rows = await switchesAfter(db, [house.plug.id], firstSwitchId);
    const stray = rows.filter((r) => r !== switched && r.cause !== "default" && r.fromOn !== null);
    if (stray.length) failures.push(`${stray.length} switches of the scenario heater came from the malformed reports (${stray.map((r) => r.cause).join(", ")})`);

    // Devices go before their house: the controller must not be left writing about rows that are gone.
    for (const link of links.splice(0)) await closeDevice(link).catch(() => undefined);
    failures.push(...(await house.remove()));
    return {
      figures: {
        switchesLost: switched ? 0 : 1,
        switchesDoubled: rows.filter((r) => r.toOn).length > 1 ? rows.filter((r) => r.toOn).length - 1 : 0,
        longestControlGapMs: reactionMs,
        crashes: watched.crashes,
        serverErrors: null,
      },
      extra: {
        payloads: TOTAL,
        delivered: tally.delivered,
        heldBack: tally.heldBack,
        disconnects,
        kinds: tally.kinds.size,
        storedFromBad: afterCount - beforeCount,
        floodSeconds: Number((floodMs / 1000).toFixed(1)),
        longestBeatGapMs: watched.longestBeatGapMs,
      },
      failures,
    };
  } finally {
    for (const link of links) await closeDevice(link).catch(() => undefined);
    await house.remove();
    await db.end();
  }
}

export const malformedPayloads: FaultScenario = {
  name: "malformed-payloads",
  quick: true,
  about: "10,000 malformed MQTT payloads from signed-in sensors and plugs on their own topics; the controller stays up, stores none and still switches on a good reading",
  run,
};
