// A simulated temperature/humidity sensor: an MQTT client that publishes a reading of
// its house every few (simulated) seconds.
import type { MqttClient } from "mqtt";
import pino, { type Logger } from "pino";
import { deviceUsername } from "../lib/mqtt/credentials";
import { sensorTopic, type ReadingPayload } from "../lib/mqtt/topics";
import { connectDevice, endClient, inFlight, withTimeout } from "./connect";
import { seedFrom, sequence } from "./random";

export type SensorSample = { tempC: number; rh: number };

export type SensorDeviceOptions = {
  url: string;
  site: string;
  device: string;
  password: string;
  clientId?: string;
  /** What the sensor measures at `nowMs`; null when there is nothing to read yet. */
  read: (nowMs: number) => SensorSample | null;
  /** Simulated ms between readings. */
  intervalMs?: number;
  now?: () => number;
  /** Real ms between the sensor's own ticks; 0 leaves ticking to the caller. */
  tickMs?: number;
  qos?: 0 | 1;
  /** Battery charge at start (0–1) and what a day of use takes off. */
  battery?: number;
  batteryPerDay?: number;
  publishTimeoutMs?: number;
  reconnectPeriod?: number;
  seed?: number;
  logger?: Logger;
};

export type SensorDevice = {
  readonly device: string;
  readonly stats: { readings: number; publishFailures: number };
  readonly client: MqttClient;
  tick(nowMs?: number): Promise<void>;
  close(): Promise<void>;
};

/** A reading as the sensor would send it: a little noise, then rounded to its resolution. */
export function toReading(sample: SensorSample, nowMs: number, battery: number, noise: () => number): ReadingPayload {
  const temp = Math.round((sample.tempC + (noise() - 0.5) * 0.2) * 10) / 10;
  const rh = Math.round(Math.min(100, Math.max(0, sample.rh + (noise() - 0.5) * 2)) * 2) / 2;
  return {
    temp_c: Math.min(90, Math.max(-60, temp)),
    rh,
    battery: Math.round(Math.min(1, Math.max(0, battery)) * 100) / 100,
    at: new Date(nowMs).toISOString(),
  };
}

export async function startSensorDevice(o: SensorDeviceOptions): Promise<SensorDevice> {
  const now = o.now ?? Date.now;
  const log = (o.logger ?? pino({ level: "silent" })).child({ sensor: o.device });
  const topic = sensorTopic(o.site, o.device);
  const intervalMs = o.intervalMs ?? 5000;
  const noise = sequence(o.seed ?? seedFrom(o.device));
  const startedMs = now();
  const stats = { readings: 0, publishFailures: 0 };
  let lastMs = -Infinity;
  let closing: Promise<void> | undefined;
  const publishes = inFlight();

  const client = await connectDevice({
    url: o.url,
    username: deviceUsername(o.site, "sensor", o.device),
    password: o.password,
    clientId: o.clientId ?? `cloche-fake-sensor-${o.site}-${o.device}`,
    reconnectPeriod: o.reconnectPeriod,
    logger: log,
    onConnect: () => undefined,
  });

  const tick = async (nowMs = now()) => {
    if (closing || !client.connected || nowMs - lastMs < intervalMs) return;
    const sample = o.read(nowMs);
    if (!sample) return;
    lastMs = nowMs;
    const battery = (o.battery ?? 0.92) - ((o.batteryPerDay ?? 0.002) * (nowMs - startedMs)) / 86_400_000;
    const reading = toReading(sample, nowMs, Math.max(0.05, battery), noise);
    try {
      await publishes.track(withTimeout(client.publishAsync(topic, JSON.stringify(reading), { qos: o.qos ?? 0 }), o.publishTimeoutMs ?? 5000, "reading"));
      stats.readings++;
    } catch (error) {
      stats.publishFailures++;
      log.warn({ err: error }, "reading not published");
    }
  };

  const timer = o.tickMs === 0 ? undefined : setInterval(() => void tick(), o.tickMs ?? 1000);

  return {
    device: o.device,
    stats,
    client,
    tick,
    close() {
      closing ??= (async () => {
        clearInterval(timer);
        await publishes.settled();
        await endClient(client);
      })();
      return closing;
    },
  };
}
