// The MQTT device contract, version 1 (see DESIGN.md): topic names and payloads.
//
//   cloche/v1/{site}/plug/{device}/command    controller → plug   QoS 1
//   cloche/v1/{site}/plug/{device}/report     plug → all          QoS 1, retained
//   cloche/v1/{site}/plug/{device}/presence   plug (last will)    retained
//   cloche/v1/{site}/sensor/{device}/reading  sensor → all        QoS 0/1
//   cloche/v1/{site}/controller/wake          web app → controller
import { z } from "zod";

export const TOPIC_ROOT = "cloche/v1";

/** A topic segment we make: lower-case letters, digits and dashes, 1–64 long. */
export const SEGMENT = /^[a-z0-9](?:[a-z0-9-]{0,62}[a-z0-9])?$/;

export type DeviceKind = "plug" | "sensor";
export type PlugChannel = "command" | "report" | "presence";
export type SensorChannel = "reading";

export class TopicError extends Error {}

function segment(value: string, what: string) {
  if (!SEGMENT.test(value)) {
    throw new TopicError(`${what} ${JSON.stringify(value)} must be 1–64 lower-case letters, digits or dashes`);
  }
  return value;
}

export function plugTopic(site: string, device: string, channel: PlugChannel) {
  return `${TOPIC_ROOT}/${segment(site, "site")}/plug/${segment(device, "device")}/${channel}`;
}

export function sensorTopic(site: string, device: string, channel: SensorChannel = "reading") {
  return `${TOPIC_ROOT}/${segment(site, "site")}/sensor/${segment(device, "device")}/${channel}`;
}

export function wakeTopic(site: string) {
  return `${TOPIC_ROOT}/${segment(site, "site")}/controller/wake`;
}

/** Subscription filters of the controller for one site. */
export function siteFilters(site: string) {
  const s = segment(site, "site");
  return [
    `${TOPIC_ROOT}/${s}/plug/+/report`,
    `${TOPIC_ROOT}/${s}/plug/+/presence`,
    `${TOPIC_ROOT}/${s}/sensor/+/reading`,
    `${TOPIC_ROOT}/${s}/controller/wake`,
  ];
}

export type ParsedTopic =
  | { site: string; kind: "plug"; device: string; channel: PlugChannel }
  | { site: string; kind: "sensor"; device: string; channel: SensorChannel }
  | { site: string; kind: "controller"; channel: "wake" };

/** Reads one of our topics; anything else is null. */
export function parseTopic(topic: string): ParsedTopic | null {
  const parts = topic.split("/");
  if (parts[0] !== "cloche" || parts[1] !== "v1") return null;
  const [, , site, kind, device, channel] = parts;
  if (!site || !SEGMENT.test(site)) return null;
  if (parts.length === 5 && kind === "controller" && device === "wake") return { site, kind: "controller", channel: "wake" };
  if (parts.length !== 6 || !device || !SEGMENT.test(device)) return null;
  if (kind === "plug" && (channel === "command" || channel === "report" || channel === "presence")) {
    return { site, kind, device, channel };
  }
  if (kind === "sensor" && channel === "reading") return { site, kind, device, channel };
  return null;
}

/**
 * MQTT 3.1.1 §4.7: a topic name is UTF-8, 1 to 65,535 bytes, without U+0000 and
 * without the wildcards `+` and `#`; names beginning with `$` are the broker's.
 */
export function isValidTopicName(topic: string) {
  const bytes = Buffer.byteLength(topic, "utf8");
  return bytes >= 1 && bytes <= 65535 && !/[\u0000+#]/.test(topic) && !topic.startsWith("$");
}

/** Largest payload we accept on any of our topics. */
export const MAX_PAYLOAD_BYTES = 4096;

const isoInstant = z.iso.datetime({ offset: true });

export const commandPayload = z.object({
  id: z.string().min(1).max(64),
  on: z.boolean(),
  lease_s: z.number().int().min(10).max(86_400),
});

export const reportPayload = z.object({
  on: z.boolean(),
  cmd: z.string().max(64).nullable().optional(),
  watts: z.number().min(0).max(100_000).nullable().optional(),
  wh: z.number().min(0).max(1e12).nullable().optional(),
  at: isoInstant,
});

export const readingPayload = z.object({
  temp_c: z.number().min(-60).max(90).nullable(),
  rh: z.number().min(0).max(100).nullable().optional(),
  battery: z.number().min(0).max(1).nullable().optional(),
  at: isoInstant,
});

export const presencePayload = z.enum(["online", "offline"]);

/** What changed; the topic names the site, and the controller reloads that site. */
export const WAKE_REASONS = ["override", "schedule", "config", "plug", "site", "house", "device"] as const;

export const wakePayload = z.object({
  reason: z.enum(WAKE_REASONS),
  plug: z.string().regex(SEGMENT).optional(),
});

export type CommandPayload = z.infer<typeof commandPayload>;
export type ReportPayload = z.infer<typeof reportPayload>;
export type ReadingPayload = z.infer<typeof readingPayload>;
export type WakePayload = z.infer<typeof wakePayload>;

export type Decoded<T> = { ok: true; value: T } | { ok: false; error: string };

/** Parses a payload: too big, not JSON or the wrong shape give a reason, never a throw. */
export function decode<S extends z.ZodType>(schema: S, payload: Buffer | string): Decoded<z.infer<S>> {
  const size = typeof payload === "string" ? Buffer.byteLength(payload) : payload.length;
  if (size > MAX_PAYLOAD_BYTES) return { ok: false, error: `payload of ${size} bytes is over ${MAX_PAYLOAD_BYTES}` };
  let value: unknown;
  try {
    value = JSON.parse(payload.toString());
  } catch {
    return { ok: false, error: "payload is not JSON" };
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return { ok: false, error: `${issue?.path.join(".") || "payload"}: ${issue?.message ?? "wrong shape"}` };
  }
  return { ok: true, value: parsed.data };
}
