// How a simulated device joins the broker: MQTT 3.1.1 (the embedded broker speaks
// nothing newer), TCP no-delay on every connection, and its own set-up after every
// (re)connect. mqtt.js reconnects by itself.
import mqtt, { type IClientOptions, type MqttClient } from "mqtt";
import type { Logger } from "pino";

export type DeviceConnectOptions = {
  url: string;
  username: string;
  password: string;
  clientId: string;
  will?: IClientOptions["will"];
  reconnectPeriod?: number;
  connectTimeout?: number;
  logger: Logger;
  /** Attached before the first subscription, so nothing that arrives is missed. */
  onMessage?: (topic: string, payload: Buffer) => void;
  /** Runs after the first connect and after each reconnect. */
  onConnect: (client: MqttClient) => Promise<void> | void;
};

/** Nagle plus delayed ACK costs about 88 ms per QoS 1 round trip on loopback. */
export function setNoDelay(client: MqttClient) {
  const stream = client.stream as unknown as { setNoDelay?: (on: boolean) => void };
  stream.setNoDelay?.(true);
}

const BROKER_AWAY = new Set(["ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT"]);

export async function connectDevice(o: DeviceConnectOptions): Promise<MqttClient> {
  const client = await mqtt.connectAsync(o.url, {
    protocolVersion: 4,
    username: o.username,
    password: o.password,
    clientId: o.clientId,
    clean: true,
    // The device resubscribes itself on every connect.
    resubscribe: false,
    reconnectPeriod: o.reconnectPeriod ?? 2000,
    connectTimeout: o.connectTimeout ?? 10_000,
    will: o.will,
  });
  const setUp = async () => {
    setNoDelay(client);
    try {
      await o.onConnect(client);
    } catch (error) {
      o.logger.warn({ err: error }, "device set-up after connect failed");
    }
  };
  if (o.onMessage) client.on("message", o.onMessage);
  client.on("error", (error) => {
    // The broker being away (the controller restarting) is a state, not a fault in
    // this code: one line per attempt, no stack trace.
    const code = (error as NodeJS.ErrnoException).code;
    if (code && BROKER_AWAY.has(code)) o.logger.warn({ code }, "broker not reachable; mqtt.js will retry");
    else o.logger.warn({ err: error }, "mqtt error");
  });
  client.on("offline", () => o.logger.debug("mqtt offline; mqtt.js will reconnect"));
  client.on("connect", () => void setUp());
  await setUp();
  return client;
}

export class DeviceTimeout extends Error {}

/** A refused publish makes the broker drop the connection, and a QoS 1 publish then never settles. */
export async function withTimeout<T>(work: Promise<T>, timeoutMs: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new DeviceTimeout(`${what} took over ${timeoutMs} ms`)), timeoutMs);
  });
  try {
    return await Promise.race([work, timeout]);
  } finally {
    clearTimeout(timer);
  }
}

/** Publishes still on their way, so that a closing device lets them land before it disconnects. */
export function inFlight() {
  const pending = new Set<Promise<unknown>>();
  return {
    track<T>(work: Promise<T>): Promise<T> {
      pending.add(work);
      work.finally(() => pending.delete(work)).catch(() => undefined);
      return work;
    },
    settled: () => Promise.allSettled([...pending]),
  };
}

/** Ends the client whatever state it is in; a dead connection is not waited for. */
export async function endClient(client: MqttClient, timeoutMs = 2000) {
  try {
    await withTimeout(client.endAsync(!client.connected), timeoutMs, "disconnect");
  } catch {
    client.end(true);
  }
}
