// Closing the simulated devices while they are busy logs nothing but their own goodbye:
// no publish on an ended client ("write after end"), no failed report.
import net from "node:net";
import type { AddressInfo } from "node:net";
import { Aedes } from "aedes";
import mqtt from "mqtt";
import pino from "pino";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startPlugDevice } from "@/fakes/plug-device";
import { startSensorDevice } from "@/fakes/sensor-device";
import { plugTopic } from "@/lib/mqtt/topics";

const SITE = "quietacre";
let broker: Aedes;
let server: net.Server;
let url: string;

beforeAll(async () => {
  broker = await Aedes.createBroker();
  server = net.createServer({ noDelay: true }, broker.handle);
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  url = `mqtt://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise<void>((resolve) => broker.close(() => resolve()));
  await new Promise<void>((resolve) => server.close(() => resolve()));
});

function capture() {
  const entries: { level: number; msg: string; err?: unknown }[] = [];
  const logger = pino({ level: "debug" }, { write: (line: string) => void entries.push(JSON.parse(line)) });
  const complaints = () => entries.filter((e) => e.level >= 40);
  return { logger, complaints };
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("closing simulated devices", () => {
  it("a plug closed while commands pour in and its own ticks report logs no error", async () => {
    for (let round = 0; round < 5; round++) {
      const { logger, complaints } = capture();
      const plug = await startPlugDevice({ url, site: SITE, device: `heater-${round}`, password: "x", ratedW: 2000, tickMs: 1, reportEveryMs: 1, reconnectPeriod: 0, logger });
      const sender = await mqtt.connectAsync(url, { protocolVersion: 4, reconnectPeriod: 0 });
      const topic = plugTopic(SITE, `heater-${round}`, "command");
      let n = 0;
      const flood = setInterval(() => sender.publish(topic, JSON.stringify({ id: `c${n++}`, on: n % 2 === 0, lease_s: 60 }), { qos: 1 }), 1);
      await pause(30 + round * 7);
      await plug.close();
      await pause(30);
      clearInterval(flood);
      await sender.endAsync();
      expect(plug.stats.commands).toBeGreaterThan(0);
      expect(complaints()).toEqual([]);
      expect(plug.stats.publishFailures).toBe(0);
    }
  });

  it("a sensor closed between its ticks and mid-publish logs no error", async () => {
    for (let round = 0; round < 5; round++) {
      const { logger, complaints } = capture();
      const sensor = await startSensorDevice({ url, site: SITE, device: `air-${round}`, password: "x", tickMs: 1, intervalMs: 0, qos: 1, reconnectPeriod: 0, logger, read: () => ({ tempC: 10, rh: 80 }) });
      await pause(20 + round * 3);
      await sensor.close();
      await pause(20);
      expect(sensor.stats.readings).toBeGreaterThan(0);
      expect(complaints()).toEqual([]);
    }
  });
});
