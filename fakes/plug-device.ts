// A simulated smart plug: an ordinary MQTT client that obeys commands on its own
// command topic and keeps a retained report of its state and meter.
import type { MqttClient } from "mqtt";
import pino, { type Logger } from "pino";
import { deviceUsername } from "../lib/mqtt/credentials";
import { commandPayload, decode, plugTopic, type CommandPayload } from "../lib/mqtt/topics";
import { connectDevice, endClient, inFlight, withTimeout } from "./connect";
import {
  applyCommand,
  fallBack,
  initialPlugState,
  leaseExpired,
  reportOf,
  resample,
  type PlugConfig,
  type PlugState,
} from "./plug-state";
import { seedFrom, sequence } from "./random";

export type PlugDeviceOptions = {
  url: string;
  site: string;
  device: string;
  password: string;
  clientId?: string;
  ratedW: number;
  failsafeOn?: boolean;
  meters?: boolean;
  /** Simulated time, ms since the epoch. */
  now?: () => number;
  /** Real ms between the plug's own ticks; 0 leaves ticking to the caller (`tick`). */
  tickMs?: number;
  /** Simulated ms between unprompted reports, so the meter is seen moving; 0 for never. */
  reportEveryMs?: number;
  reconnectPeriod?: number;
  publishTimeoutMs?: number;
  seed?: number;
  logger?: Logger;
  /** Told of every change of state, with why. */
  onSwitch?: (on: boolean, atMs: number, cause: "command" | "lease") => void;
  /** Told of everything the plug does to its state: its start, each command it obeys (repeats too), each lease fall-back. */
  journal?: (entry: PlugJournalEntry) => void;
};

/** One line of a plug's own record (fakes/journal.ts): what it did, by its own clock. */
export type PlugJournalEntry = {
  device: string;
  what: "start" | "command" | "lease";
  /** The command's id; null for a start or a fall-back. */
  id: string | null;
  on: boolean;
  /** The state changed (a start always counts as unchanged). */
  changed: boolean;
  atMs: number;
};

export type PlugStats = { commands: number; malformed: number; reports: number; publishFailures: number; fallbacks: number };

export type PlugDevice = {
  readonly device: string;
  readonly on: boolean;
  readonly state: PlugState;
  readonly stats: PlugStats;
  readonly client: MqttClient;
  /** Checks the lease and the report timer at `nowMs` (default: the plug's clock). */
  tick(nowMs?: number): Promise<void>;
  close(): Promise<void>;
};

export async function startPlugDevice(o: PlugDeviceOptions): Promise<PlugDevice> {
  const now = o.now ?? Date.now;
  const config: PlugConfig = { ratedW: o.ratedW, failsafeOn: o.failsafeOn ?? false, meters: o.meters ?? true };
  const log = (o.logger ?? pino({ level: "silent" })).child({ plug: o.device });
  const topics = {
    command: plugTopic(o.site, o.device, "command"),
    report: plugTopic(o.site, o.device, "report"),
    presence: plugTopic(o.site, o.device, "presence"),
  };
  const random = sequence(o.seed ?? seedFrom(o.device));
  const jitter = () => random() * 2 - 1;
  const publishTimeoutMs = o.publishTimeoutMs ?? 5000;
  const reportEveryMs = o.reportEveryMs ?? 60_000;
  const stats: PlugStats = { commands: 0, malformed: 0, reports: 0, publishFailures: 0, fallbacks: 0 };

  let state = initialPlugState(config, now());
  o.journal?.({ device: o.device, what: "start", id: null, on: state.on, changed: false, atMs: now() });
  let lastReportMs = -Infinity;
  let closing: Promise<void> | undefined;
  const publishes = inFlight();
  // Set on the first connect, before connectDevice returns.
  let mq: MqttClient | undefined;

  /** Nothing goes out once the plug is closing, apart from its goodbye (`farewell`). */
  const publish = async (topic: string, payload: unknown, retain: boolean, timeoutMs = publishTimeoutMs, farewell = false) => {
    if (!mq || (closing && !farewell)) return;
    try {
      await publishes.track(withTimeout(mq.publishAsync(topic, JSON.stringify(payload), { qos: 1, retain }), timeoutMs, `publish to ${topic}`));
    } catch (error) {
      stats.publishFailures++;
      log.warn({ err: error, topic }, "publish failed");
    }
  };

  const report = (atMs: number) => {
    lastReportMs = atMs;
    stats.reports++;
    return publish(topics.report, reportOf(config, state, atMs), true);
  };

  const obey = (command: CommandPayload) => {
    const atMs = now();
    const was = state.on;
    state = applyCommand(config, state, command, atMs, jitter());
    stats.commands++;
    if (state.on !== was) o.onSwitch?.(state.on, atMs, "command");
    o.journal?.({ device: o.device, what: "command", id: command.id, on: state.on, changed: state.on !== was, atMs });
    log.debug({ id: command.id, on: command.on, lease_s: command.lease_s }, "command");
    // Echo the id even when the state is unchanged: that is the acknowledgement.
    return report(atMs);
  };

  const client = await connectDevice({
    url: o.url,
    username: deviceUsername(o.site, "plug", o.device),
    password: o.password,
    clientId: o.clientId ?? `cloche-fake-plug-${o.site}-${o.device}`,
    will: { topic: topics.presence, payload: Buffer.from(JSON.stringify("offline")), qos: 1, retain: true },
    reconnectPeriod: o.reconnectPeriod,
    logger: log,
    onMessage: (topic, payload) => {
      if (topic !== topics.command || closing) return;
      const decoded = decode(commandPayload, payload);
      if (!decoded.ok) {
        stats.malformed++;
        log.warn({ reason: decoded.error }, "malformed command dropped");
        return;
      }
      void obey(decoded.value);
    },
    onConnect: async (c) => {
      mq = c;
      const granted = await withTimeout(c.subscribeAsync(topics.command, { qos: 1 }), publishTimeoutMs, "subscribe");
      if (granted.some((g) => g.qos === 128)) log.error({ topic: topics.command }, "the broker refused the command subscription");
      await publish(topics.presence, "online", true);
      await report(now());
    },
  });

  const tick = async (nowMs = now()) => {
    if (closing) return;
    if (leaseExpired(state, nowMs)) {
      const was = state.on;
      state = fallBack(config, state, nowMs, jitter());
      stats.fallbacks++;
      if (state.on !== was) o.onSwitch?.(state.on, nowMs, "lease");
      o.journal?.({ device: o.device, what: "lease", id: null, on: state.on, changed: state.on !== was, atMs: nowMs });
      log.info({ on: state.on }, "lease ran out: fail-safe state");
      await report(nowMs);
      return;
    }
    state = resample(config, state, nowMs, jitter());
    if (reportEveryMs > 0 && nowMs - lastReportMs >= reportEveryMs) await report(nowMs);
  };

  const timer = o.tickMs === 0 ? undefined : setInterval(() => void tick(), o.tickMs ?? 1000);

  return {
    device: o.device,
    get on() {
      return state.on;
    },
    get state() {
      return state;
    },
    stats,
    client,
    tick,
    close() {
      closing ??= (async () => {
        clearInterval(timer);
        // No more commands: one arriving after the disconnect would have its
        // acknowledgement written to an ended socket ("write after end").
        if (client.connected) {
          await withTimeout(client.unsubscribeAsync(topics.command), Math.min(publishTimeoutMs, 1000), "unsubscribe").catch(() => undefined);
        }
        // Reports already on their way land first; nothing new starts (see publish).
        await publishes.settled();
        // A clean disconnect does not fire the will: say so ourselves.
        if (client.connected) await publish(topics.presence, "offline", true, Math.min(publishTimeoutMs, 1000), true);
        await endClient(client);
      })();
      return closing;
    },
  };
}
