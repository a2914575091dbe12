// How the controller talks to its broker: subscribe to a few topic filters, hear what
// arrives on them, publish commands at QoS 1. Two ways in:
//   - over the network with mqtt.js, to an external broker (MQTT_URL), which
//     reconnects by itself and subscribes again on every connect;
//   - in-process, to the embedded broker it runs itself (controller/broker.ts), with
//     no socket, no packet encoding and no acknowledgements between the two.
import { randomUUID } from "node:crypto";
import mqtt from "mqtt";
import type { Logger } from "pino";

export type LinkOptions = {
  /** Topic filters; what was retained on them is heard once on subscribing, as MQTT does. */
  subscriptions: string[];
  onMessage: (topic: string, payload: Buffer) => void;
  logger: Logger;
};

export type BrokerLink = {
  /** Publishes at QoS 1, not retained; `onError` hears a publish the broker did not take. */
  publish: (topic: string, payload: string, onError: (error: Error) => void) => void;
  close: () => Promise<void>;
  /** Settles once the subscriptions are in place (retained messages follow at once). */
  subscribed: Promise<void>;
};

export type NetworkLinkOptions = LinkOptions & { url: string; username: string; password: string };

export function connectNetworkLink(options: NetworkLinkOptions): BrokerLink {
  const { logger } = options;
  const client = mqtt.connect(options.url, {
    protocolVersion: 4,
    clientId: `cloche-controller-${randomUUID().slice(0, 8)}`,
    username: options.username,
    password: options.password,
    clean: true,
    reconnectPeriod: 1000,
    connectTimeout: 10_000,
  });
  let markSubscribed: () => void = () => undefined;
  const subscribed = new Promise<void>((resolve) => (markSubscribed = resolve));
  client.on("connect", () => {
    // Without no-delay a QoS 1 round trip on loopback waits ~40 ms for delayed ACKs.
    (client.stream as unknown as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
    logger.info({ url: options.url }, "connected to the MQTT broker");
    client.subscribe(options.subscriptions, { qos: 1 }, (error) => {
      if (error) logger.error({ err: error }, "subscription failed");
      else markSubscribed();
    });
  });
  client.on("reconnect", () => logger.warn("reconnecting to the MQTT broker"));
  client.on("error", (error) => logger.error({ err: error }, "MQTT error"));
  client.on("message", (topic, payload) => options.onMessage(topic, payload));

  let closing: Promise<void> | undefined;
  return {
    publish(topic, payload, onError) {
      client.publish(topic, payload, { qos: 1 }, (error) => {
        if (error) onError(error);
      });
    },
    close: () => (closing ??= client.endAsync().catch(() => undefined)),
    subscribed,
  };
}
