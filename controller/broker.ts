// The embedded MQTT broker (aedes) on 127.0.0.1: every device signs in with its own
// credentials and may use only its own topics; the controller and the web app have
// their own sign-ins and rights.
import net from "node:net";
import { Aedes, type Client } from "aedes";
import type { Logger } from "pino";
import {
  CONTROLLER_USERNAME,
  WEBAPP_USERNAME,
  mayPublish,
  maySubscribe,
  parseDeviceUsername,
  sameSecret,
  verifyDeviceSecret,
  type Principal,
} from "@/lib/mqtt/credentials";

export type BrokerOptions = {
  host: string;
  port: number;
  controllerSecret: string;
  webappSecret: string;
  /** The stored hash of a device's current secret, or null when it has none. */
  lookupDeviceSecret: (username: string) => Promise<string | null>;
  logger: Logger;
};

export type Broker = {
  port: number;
  counts: { refusedLogins: number; refusedPublishes: number; refusedSubscriptions: number };
  close: () => Promise<void>;
};

const principals = new WeakMap<Client, Principal>();

function authError(message: string) {
  return Object.assign(new Error(message), { returnCode: 4 as const });
}

export async function createBroker(options: BrokerOptions): Promise<Broker> {
  const { logger } = options;
  const counts = { refusedLogins: 0, refusedPublishes: 0, refusedSubscriptions: 0 };

  const aedes = await Aedes.createBroker({
    authenticate(client, username, password, done) {
      const secret = password?.toString() ?? "";
      const refuse = (why: string) => {
        counts.refusedLogins++;
        logger.warn({ clientId: client.id, username, why }, "mqtt sign-in refused");
        done(authError("bad user name or password"), false);
      };
      if (!username || !secret) return refuse("no credentials");
      if (username === CONTROLLER_USERNAME || username === WEBAPP_USERNAME) {
        const expected = username === CONTROLLER_USERNAME ? options.controllerSecret : options.webappSecret;
        if (!sameSecret(secret, expected)) return refuse("wrong secret");
        principals.set(client, { kind: username === CONTROLLER_USERNAME ? "controller" : "webapp" });
        return done(null, true);
      }
      const principal = parseDeviceUsername(username);
      if (!principal) return refuse("unknown user name");
      options
        .lookupDeviceSecret(username)
        .then((stored) => {
          if (!stored || !verifyDeviceSecret(secret, stored)) return refuse("wrong secret");
          principals.set(client, principal);
          done(null, true);
        })
        .catch((error: unknown) => {
          logger.error({ err: error, username }, "credential lookup failed");
          done(Object.assign(new Error("server unavailable"), { returnCode: 3 as const }), false);
        });
    },
    authorizePublish(client, packet, done) {
      // Messages the broker publishes itself (client null) are ours.
      if (!client) return done(null);
      const principal = principals.get(client);
      if (principal && mayPublish(principal, packet.topic)) return done(null);
      counts.refusedPublishes++;
      logger.warn({ clientId: client.id, topic: packet.topic }, "mqtt publish refused");
      done(new Error("not allowed to publish here"));
    },
    authorizeSubscribe(client, subscription, done) {
      const principal = principals.get(client);
      if (principal && maySubscribe(principal, subscription.topic)) return done(null, subscription);
      counts.refusedSubscriptions++;
      logger.warn({ clientId: client.id, topic: subscription.topic }, "mqtt subscription refused");
      done(null, null);
    },
  });

  // Without no-delay a QoS 1 round trip on loopback waits ~40 ms for delayed ACKs.
  const server = net.createServer({ noDelay: true }, aedes.handle);
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen({ host: options.host, port: options.port }, () => resolve());
  });
  const port = (server.address() as net.AddressInfo).port;
  logger.info({ host: options.host, port }, "embedded MQTT broker listening");

  let closing: Promise<void> | undefined;
  return {
    port,
    counts,
    close: () =>
      (closing ??= (async () => {
        await new Promise<void>((resolve) => aedes.close(() => resolve()));
        await new Promise<void>((resolve) => server.close(() => resolve()));
      })()),
  };
}
