// MQTT clients that sign in as devices: with the demo devices' secrets (the file the
// simulator reads) or with a secret a scenario issued through the app. A scenario plug
// obeys commands the way a real one does: it switches and echoes the command id.
import { readFileSync } from "node:fs";
import mqtt, { type MqttClient } from "mqtt";
import { deviceUsername } from "../../../lib/mqtt/credentials";
import { plugTopic, sensorTopic, commandPayload } from "../../../lib/mqtt/topics";
import type { FaultContext } from "../scenario";

export function demoSecret(context: FaultContext, site: string, kind: "plug" | "sensor", device: string): string {
  const secrets = JSON.parse(readFileSync(context.deviceSecretsFile, "utf8")) as Record<string, string>;
  const secret = secrets[deviceUsername(site, kind, device)];
  if (!secret) throw new Error(`no secret for ${deviceUsername(site, kind, device)} in ${context.deviceSecretsFile}`);
  return secret;
}

export type DeviceLink = { client: MqttClient; username: string; closed: boolean; disconnects: number };

/** Signs in as one device; rejects when the broker refuses it. */
export async function connectDevice(
  mqttUrl: string,
  who: { site: string; kind: "plug" | "sensor"; device: string; secret: string },
  options: { will?: boolean; reconnect?: boolean } = {},
): Promise<DeviceLink> {
  const username = deviceUsername(who.site, who.kind, who.device);
  const client = mqtt.connect(mqttUrl, {
    username,
    password: who.secret,
    clientId: `fault-${who.kind}-${who.device}-${Math.random().toString(36).slice(2, 8)}`,
    reconnectPeriod: options.reconnect === false ? 0 : 500,
    connectTimeout: 10_000,
    ...(options.will && who.kind === "plug"
      ? { will: { topic: plugTopic(who.site, who.device, "presence"), payload: Buffer.from('"offline"'), qos: 1 as const, retain: true } }
      : {}),
  });
  const link: DeviceLink = { client, username, closed: false, disconnects: 0 };
  client.on("close", () => {
    if (!link.closed) link.disconnects++;
  });
  await new Promise<void>((resolve, reject) => {
    client.once("connect", () => resolve());
    client.once("error", (error) => {
      client.end(true);
      reject(new Error(`${username} could not sign in: ${error.message}`));
    });
  });
  return link;
}

export async function closeDevice(link: DeviceLink) {
  link.closed = true;
  await link.client.endAsync();
}

/** Waits until the client is connected again (after a broker limit dropped it), up to a limit. */
export async function connected(link: DeviceLink, timeoutMs = 15_000) {
  const until = Date.now() + timeoutMs;
  while (!link.client.connected) {
    if (Date.now() > until) throw new Error(`${link.username} did not reconnect within ${timeoutMs / 1000} s`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

export function publishReading(link: DeviceLink, site: string, device: string, reading: { temp_c: number | null; at: Date; rh?: number }) {
  const payload = JSON.stringify({ temp_c: reading.temp_c, rh: reading.rh ?? 70, battery: 0.9, at: reading.at.toISOString() });
  return link.client.publishAsync(sensorTopic(site, device), payload, { qos: 1 });
}

export type PlugReport = { on: boolean; cmd: string | null; at: Date; watts?: number };

export function publishReport(link: DeviceLink, site: string, device: string, report: PlugReport) {
  const payload = JSON.stringify({ on: report.on, cmd: report.cmd, watts: report.watts ?? (report.on ? 1000 : 0), at: report.at.toISOString() });
  return link.client.publishAsync(plugTopic(site, device, "report"), payload, { qos: 1, retain: true });
}

export type ScenarioPlug = {
  link: DeviceLink;
  /** Every command heard, in order. */
  commands: { id: string; on: boolean; atMs: number }[];
  state: () => { on: boolean; cmd: string | null };
  /** While false, commands are heard but not carried out or answered. */
  obeying: boolean;
  close: () => Promise<void>;
};

/** A plug that carries out each command and reports it, as the device contract says. */
export async function startScenarioPlug(mqttUrl: string, who: { site: string; device: string; secret: string }): Promise<ScenarioPlug> {
  const link = await connectDevice(mqttUrl, { ...who, kind: "plug" }, { will: true });
  let on = false;
  let cmd: string | null = null;
  const plug: ScenarioPlug = {
    link,
    commands: [],
    state: () => ({ on, cmd }),
    obeying: true,
    close: async () => {
      await link.client.unsubscribeAsync(plugTopic(who.site, who.device, "command"));
      await closeDevice(link);
    },
  };
  link.client.on("message", (_topic, payload) => {
    let parsed;
    try {
      parsed = commandPayload.safeParse(JSON.parse(payload.toString()));
    } catch {
      return;
    }
    if (!parsed.success) return;
    plug.commands.push({ id: parsed.data.id, on: parsed.data.on, atMs: Date.now() });
    if (!plug.obeying) return;
    on = parsed.data.on;
    cmd = parsed.data.id;
    void publishReport(link, who.site, who.device, { on, cmd, at: new Date() });
  });
  await link.client.subscribeAsync(plugTopic(who.site, who.device, "command"), { qos: 1 });
  await link.client.publishAsync(plugTopic(who.site, who.device, "presence"), '"online"', { qos: 1, retain: true });
  await publishReport(link, who.site, who.device, { on, cmd, at: new Date() });
  return plug;
}

export const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Polls until `check` gives a value, or null after the time limit. */
export async function waitFor<T>(check: () => Promise<T | null | undefined | false>, timeoutMs: number, everyMs = 250): Promise<T | null> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > until) return null;
    await sleep(everyMs);
  }
}
