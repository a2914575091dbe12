import "server-only";
import mqtt, { type MqttClient } from "mqtt";
import { env } from "@/lib/server/env";
import { WEBAPP_USERNAME } from "@/lib/mqtt/credentials";
import { wakeTopic, type WakePayload } from "@/lib/mqtt/topics";

// One connection per server process, opened on first use.
const holder = globalThis as unknown as { __clocheWake?: MqttClient };

function client(): MqttClient | null {
  const e = env();
  if (!e.CLOCHE_MQTT_WEBAPP_SECRET) return null;
  holder.__clocheWake ??= mqtt.connect(e.CLOCHE_MQTT_URL, {
    protocolVersion: 4,
    username: WEBAPP_USERNAME,
    password: e.CLOCHE_MQTT_WEBAPP_SECRET,
    clientId: `cloche-webapp-${process.pid}-${Math.random().toString(36).slice(2, 8)}`,
    reconnectPeriod: 2000,
    connectTimeout: 3000,
  }).on("connect", function (this: MqttClient) {
    (this.stream as unknown as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
  });
  return holder.__clocheWake;
}

/**
 * Nudges the controller to reload and act now. Best effort: when the broker is away
 * the controller still picks the change up on its periodic reload.
 */
export async function wakeController(siteSlug: string, payload: WakePayload): Promise<boolean> {
  const c = client();
  if (!c) return false;
  try {
    await Promise.race([
      c.publishAsync(wakeTopic(siteSlug), JSON.stringify(payload), { qos: 0 }),
      new Promise((_, reject) => setTimeout(() => reject(new Error("wake-up timed out")), 1000)),
    ]);
    return true;
  } catch (error) {
    console.warn("[cloche] could not wake the controller", error);
    return false;
  }
}
