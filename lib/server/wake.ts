import "server-only";
import mqtt, { type MqttClient } from "mqtt";
import { env } from "@/lib/server/env";
import { WEBAPP_USERNAME } from "@/lib/mqtt/credentials";
import { wakeTopic, type WakePayload } from "@/lib/mqtt/topics";

/** Where the web app publishes its wake-ups, and its MQTT secret there. */
export type WakeBroker = { url: string; secret: string };

const WAIT_MS = 1000;

// One connection per server process, opened on first use (kept on globalThis so that
// Next's development reloads do not open another).
const holder = globalThis as unknown as { __clocheWake?: { client: MqttClient | null; broker?: WakeBroker | null } };
const state = (holder.__clocheWake ??= { client: null });

function brokerFromEnv(): WakeBroker | null {
  const e = env();
  return e.CLOCHE_MQTT_WEBAPP_SECRET ? { url: e.CLOCHE_MQTT_URL, secret: e.CLOCHE_MQTT_WEBAPP_SECRET } : null;
}

/**
 * Points wake-ups at a broker other than the environment's (null: none). For
 * processes that start their own controller, such as the integration tests.
 */
export async function setWakeBroker(broker: WakeBroker | null): Promise<void> {
  const old = state.client;
  state.client = null;
  state.broker = broker;
  await old?.endAsync(true);
}

/** The broker the web app uses: the one set by setWakeBroker, else the environment's (null: none). */
export function webappBroker(): WakeBroker | null {
  return state.broker !== undefined ? state.broker : brokerFromEnv();
}

function client(): MqttClient | null {
  if (state.client) return state.client;
  const broker = webappBroker();
  if (!broker) return null;
  state.client = mqtt
    .connect(broker.url, {
      protocolVersion: 4,
      username: WEBAPP_USERNAME,
      password: broker.secret,
      clientId: `cloche-webapp-${process.pid}-${Math.random().toString(36).slice(2, 8)}`,
      reconnectPeriod: 2000,
      connectTimeout: 3000,
    })
    .on("connect", function (this: MqttClient) {
      (this.stream as unknown as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
    })
    // A broker that is away is not an error of the request; the reconnects go on.
    .on("error", () => {});
  return state.client;
}

/**
 * Nudges the site's controller to reload and act now. Best effort, never throws: with
 * the broker connected it waits up to a second for the publish; before the first
 * connection (or while the broker is away) the wake-up waits in the client's queue and
 * the request does not, and the controller's periodic reload is the backstop.
 */
export async function wakeController(siteSlug: string, payload: WakePayload): Promise<boolean> {
  const c = client();
  if (!c) return false;
  try {
    const topic = wakeTopic(siteSlug);
    const message = JSON.stringify(payload);
    if (!c.connected) {
      c.publish(topic, message, { qos: 0 }, () => {});
      return false;
    }
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([
      c.publishAsync(topic, message, { qos: 0 }),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("wake-up timed out")), WAIT_MS);
      }),
    ]).finally(() => clearTimeout(timer));
    return true;
  } catch (error) {
    console.warn("[cloche] could not wake the controller", error);
    return false;
  }
}
