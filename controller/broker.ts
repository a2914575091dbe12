// The embedded MQTT broker (aedes) on 127.0.0.1: every device signs in with its own
// credentials and may use only its own topics; the controller and the web app have
// their own sign-ins and rights.
import net from "node:net";
import { Aedes, type Client } from "aedes";
import type { Logger } from "pino";
import type { BrokerLink, LinkOptions } from "./link";
import {
  CONTROLLER_USERNAME,
  WEBAPP_USERNAME,
  deviceUsername,
  mayPublish,
  maySubscribe,
  parseDeviceUsername,
  type Principal,
} from "@/lib/mqtt/credentials";
import { sameSecret, verifyDeviceSecret } from "@/lib/server/device-secrets";
import { DEFAULT_DEVICE_LIMITS, checkTrafficLimits, type TrafficLimits } from "@/lib/mqtt/traffic-limit";
import { createTrafficJudge, type LimitEvent } from "./traffic-judge";
import { guardConnection } from "./traffic-guard";

export type BrokerOptions = {
  host: string;
  port: number;
  controllerSecret: string;
  webappSecret: string;
  /**
   * The stored hash of a device's current secret, or null when it has none. Answered
   * from memory: a device signing in must never wait on the database.
   */
  deviceSecret: (username: string) => string | null;
  /**
   * Asked only when memory does not accept a device's secret (a credential issued a
   * moment ago): the stored hash, or null. It may wait on the database, bounded by the
   * database's deadline; devices already known never come here.
   */
  lookUpDeviceSecret?: (username: string) => Promise<string | null>;
  logger: Logger;
  /** Per-device limits on rate and size; the controller and the web app have none. */
  deviceLimits?: Partial<TrafficLimits>;
  /** Told each time a device is held back (once a spell), refused a packet too large, or disconnected. */
  onLimit?: (event: LimitEvent) => void;
};

export type BrokerCounts = {
  refusedLogins: number;
  refusedPublishes: number;
  refusedSubscriptions: number;
  /** Spells of a device being held back for sending too fast. */
  slowed: number;
  /** Packets refused (and their devices disconnected) for being too large. */
  oversized: number;
  /** Devices disconnected for going on too fast. */
  disconnected: number;
  /** Sign-ins refused while a disconnected device cools off. */
  refusedCoolingOff: number;
};

export type Broker = {
  port: number;
  counts: BrokerCounts;
  /** The controller's own way in: no socket, no encoding, no acknowledgements. */
  link: (options: LinkOptions) => Promise<BrokerLink>;
  /**
   * Signs out the site's (or every site's) connected devices whose credential has been
   * revoked or replaced since they signed in (a retired device, a revoked or re-issued
   * secret). Returns how many were signed out.
   */
  recheckDevices: (siteSlug?: string) => number;
  close: () => Promise<void>;
};

type RetainedPacket = { topic: string; payload: Buffer | string };
type RetainedStore = { createRetainedStreamCombi: (patterns: string[]) => AsyncIterable<RetainedPacket> };

const principals = new WeakMap<Client, Principal>();
/** The stored hash each device signed in against, to notice when it is revoked or replaced. */
const signedInWith = new WeakMap<Client, string>();

function authError(message: string) {
  return Object.assign(new Error(message), { returnCode: 4 as const });
}

export async function createBroker(options: BrokerOptions): Promise<Broker> {
  const { logger } = options;
  const counts: BrokerCounts = {
    refusedLogins: 0,
    refusedPublishes: 0,
    refusedSubscriptions: 0,
    slowed: 0,
    oversized: 0,
    disconnected: 0,
    refusedCoolingOff: 0,
  };
  const limits = checkTrafficLimits({ ...DEFAULT_DEVICE_LIMITS, ...options.deviceLimits });

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
      const accept = (stored: string) => {
        principals.set(client, principal);
        signedInWith.set(client, stored);
        done(null, true);
      };
      const held = options.deviceSecret(username);
      if (held && verifyDeviceSecret(secret, held)) return accept(held);
      if (!options.lookUpDeviceSecret) return refuse("wrong secret");
      options
        .lookUpDeviceSecret(username)
        .then((stored) => {
          if (!stored || stored === held || !verifyDeviceSecret(secret, stored)) return refuse("wrong secret");
          accept(stored);
        })
        .catch((error: unknown) => {
          logger.warn({ err: error, username }, "a credential not yet held could not be looked up");
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

  // Each connection goes through the per-device limits (controller/traffic-guard.ts) on its way in.
  const judge = createTrafficJudge({ limits, counts, logger, onLimit: options.onLimit, principalOf: (client) => principals.get(client) });
  // Without no-delay a QoS 1 round trip on loopback waits ~40 ms for delayed ACKs.
  const server = net.createServer({ noDelay: true }, (socket) => {
    const stream = guardConnection(socket, { connectMaxBytes: limits.maxPacketBytes, judge: judge.connection(() => (stream as { client?: Client }).client) });
    aedes.handle(stream);
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen({ host: options.host, port: options.port }, () => resolve());
  });
  const port = (server.address() as net.AddressInfo).port;
  logger.info({ host: options.host, port }, "embedded MQTT broker listening");

  async function link(o: LinkOptions): Promise<BrokerLink> {
    const toBuffer = (payload: Buffer | string) => (typeof payload === "string" ? Buffer.from(payload) : payload);
    let replaying: Set<string> | null = new Set();
    const deliver = (packet: RetainedPacket, done: () => void) => {
      replaying?.add(packet.topic);
      o.onMessage(packet.topic, toBuffer(packet.payload));
      done();
    };
    await Promise.all(o.subscriptions.map((topic) => new Promise<void>((resolve) => aedes.subscribe(topic, deliver, resolve))));
    // What a subscription over the network would hear first: the retained messages,
    // except where a newer one has already arrived live.
    const retained = (aedes as unknown as { persistence: RetainedStore }).persistence;
    for await (const packet of retained.createRetainedStreamCombi(o.subscriptions)) {
      if (!replaying.has(packet.topic)) o.onMessage(packet.topic, toBuffer(packet.payload));
    }
    replaying = null;
    let closed = false;
    return {
      publish(topic, payload, onError) {
        if (closed) return onError(new Error("link closed"));
        aedes.publish({ cmd: "publish", topic, payload: Buffer.from(payload), qos: 1, retain: false, dup: false }, (error) => {
          if (error) onError(error);
        });
      },
      async close() {
        if (closed) return;
        closed = true;
        await Promise.all(o.subscriptions.map((topic) => new Promise<void>((resolve) => aedes.unsubscribe(topic, deliver, resolve))));
      },
      // In place, and the retained messages heard, before this link was handed out.
      subscribed: Promise.resolve(),
    };
  }

  function recheckDevices(siteSlug?: string): number {
    const clients = Object.values((aedes as unknown as { clients: Record<string, Client> }).clients);
    let signedOut = 0;
    for (const client of clients) {
      const principal = principals.get(client);
      if (!principal || (principal.kind !== "plug" && principal.kind !== "sensor") || (siteSlug !== undefined && principal.site !== siteSlug)) continue;
      const stored = options.deviceSecret(deviceUsername(principal.site, principal.kind, principal.device));
      if (stored !== null && stored === signedInWith.get(client)) continue;
      logger.info({ clientId: client.id, device: principal.device }, "device signed out: its credential was revoked or replaced");
      client.close();
      signedOut++;
    }
    return signedOut;
  }

  let closing: Promise<void> | undefined;
  return {
    port,
    counts,
    link,
    recheckDevices,
    close: () =>
      (closing ??= (async () => {
        await new Promise<void>((resolve) => aedes.close(() => resolve()));
        await new Promise<void>((resolve) => server.close(() => resolve()));
      })()),
  };
}
