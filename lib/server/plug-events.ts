import "server-only";
import mqtt, { type MqttClient } from "mqtt";
import { WEBAPP_USERNAME } from "@/lib/mqtt/credentials";
import { TOPIC_ROOT, decode, parseTopic, presencePayload, reportPayload } from "@/lib/mqtt/topics";
import { webappBroker, type WakeBroker } from "./wake";

/** What a page is told of a plug: its own report, or its presence. `receivedAt` is the server's clock. */
export type PlugEvent =
  | { type: "report"; on: boolean; at: string; receivedAt: number }
  | { type: "presence"; online: boolean; receivedAt: number };

export type PlugLatest = { report: Extract<PlugEvent, { type: "report" }> | null; presence: Extract<PlugEvent, { type: "presence" }> | null };

type Listener = (event: PlugEvent) => void;

/** The two filters of the web app's one subscription: every plug's report and presence. */
export const PLUG_EVENT_FILTERS = [`${TOPIC_ROOT}/+/plug/+/report`, `${TOPIC_ROOT}/+/plug/+/presence`];

const READY_WAIT_MS = 2000;

type State = {
  client: MqttClient | null;
  broker: WakeBroker | null;
  subscribed: Promise<boolean> | null;
  listeners: Map<string, Set<Listener>>;
  latest: Map<string, PlugLatest>;
};

// One connection per server process, opened when the first page listens, kept on
// globalThis so that Next's development reloads do not open another.
const holder = globalThis as unknown as { __clochePlugEvents?: State };
const state = (holder.__clochePlugEvents ??= { client: null, broker: null, subscribed: null, listeners: new Map(), latest: new Map() });

const keyOf = (site: string, device: string) => `${site}/${device}`;

function dispatch(topic: string, payload: Buffer) {
  const parsed = parseTopic(topic);
  if (!parsed || parsed.kind !== "plug" || parsed.channel === "command") return;
  const key = keyOf(parsed.site, parsed.device);
  const receivedAt = Date.now();
  const latest = state.latest.get(key) ?? { report: null, presence: null };
  let event: PlugEvent;
  if (parsed.channel === "report") {
    const report = decode(reportPayload, payload);
    if (!report.ok) return;
    event = { type: "report", on: report.value.on, at: report.value.at, receivedAt };
    latest.report = event;
  } else {
    const presence = decode(presencePayload, payload);
    if (!presence.ok) return;
    event = { type: "presence", online: presence.value === "online", receivedAt };
    latest.presence = event;
  }
  state.latest.set(key, latest);
  for (const listener of state.listeners.get(key) ?? []) listener(event);
}

function connect(broker: WakeBroker) {
  const client = mqtt.connect(broker.url, {
    protocolVersion: 4,
    username: WEBAPP_USERNAME,
    password: broker.secret,
    clientId: `cloche-webapp-events-${process.pid}-${Math.random().toString(36).slice(2, 8)}`,
    reconnectPeriod: 1000,
    connectTimeout: 3000,
    clean: true,
  });
  state.subscribed = new Promise((resolve) => {
    // A clean session: subscribe again on every (re)connection; the retained reports
    // replayed then bring the latest state of every plug.
    client.on("connect", () => {
      (client.stream as unknown as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
      client.subscribe(PLUG_EVENT_FILTERS, { qos: 1 }, (error, granted) => {
        const ok = !error && (granted ?? []).every((g) => g.qos !== 128);
        if (!ok) console.warn("[cloche] the web app could not subscribe to plug reports", error ?? granted);
        resolve(ok);
      });
    });
  });
  client.on("message", dispatch);
  // A broker that is away is not an error of a page; the reconnects go on.
  client.on("error", () => {});
  state.client = client;
  state.broker = broker;
}

/**
 * The web app's one subscription to the plugs' reports and presence, connected on
 * first use and reused; resolves whether it is subscribed (false after a short wait
 * when the broker is away or there is none). Follows setWakeBroker in tests.
 */
export async function plugEventsReady(): Promise<boolean> {
  const broker = webappBroker();
  if (broker?.url !== state.broker?.url || broker?.secret !== state.broker?.secret) {
    const old = state.client;
    state.client = null;
    state.broker = null;
    state.subscribed = null;
    state.latest.clear();
    await old?.endAsync(true);
    if (broker) connect(broker);
  }
  if (!state.subscribed) return false;
  let timer: NodeJS.Timeout | undefined;
  const waited = new Promise<boolean>((resolve) => {
    timer = setTimeout(() => resolve(false), READY_WAIT_MS);
  });
  return Promise.race([state.subscribed, waited]).finally(() => clearTimeout(timer));
}

/** Whether the subscription is connected now. */
export const plugEventsConnected = () => state.client?.connected ?? false;

/** The latest report and presence heard from one plug since the subscription began. */
export function latestPlugEvents(site: string, device: string): PlugLatest {
  return state.latest.get(keyOf(site, device)) ?? { report: null, presence: null };
}

/** Calls `listener` for each report and presence of one plug; returns the unsubscribe. */
export function onPlugEvent(site: string, device: string, listener: Listener): () => void {
  const key = keyOf(site, device);
  const set = state.listeners.get(key) ?? new Set();
  set.add(listener);
  state.listeners.set(key, set);
  return () => {
    set.delete(listener);
    if (set.size === 0) state.listeners.delete(key);
  };
}

/** Closes the subscription (tests). */
export async function closePlugEvents(): Promise<void> {
  const old = state.client;
  state.client = null;
  state.broker = null;
  state.subscribed = null;
  state.latest.clear();
  await old?.endAsync(true);
}
