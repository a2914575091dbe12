// What arrives from the broker: the topic says who sent it, the payload is checked
// against the device contract, and each kind of message goes to its handler. A
// message that fails anywhere is dropped, counted and logged, never fatal.
import type { Logger } from "pino";
import {
  TOPIC_ROOT,
  decode,
  parseTopic,
  presencePayload,
  readingPayload,
  reportPayload,
  wakePayload,
  type ReadingPayload,
  type ReportPayload,
  type WakePayload,
} from "@/lib/mqtt/topics";

export type InboxHandlers = {
  reading: (site: string, device: string, reading: ReadingPayload, nowMs: number) => string | void;
  report: (site: string, device: string, report: ReportPayload, nowMs: number) => string | void;
  presence: (site: string, device: string, online: boolean, nowMs: number) => string | void;
  wake: (site: string, wake: WakePayload) => void;
};

/** What the controller listens to. */
export const INBOX_SUBSCRIPTIONS = [
  `${TOPIC_ROOT}/+/plug/+/report`,
  `${TOPIC_ROOT}/+/plug/+/presence`,
  `${TOPIC_ROOT}/+/sensor/+/reading`,
  `${TOPIC_ROOT}/+/controller/wake`,
];

export function createInbox(options: { handlers: InboxHandlers; now: () => number; logger: Logger }) {
  const { handlers, logger } = options;
  const dropped: Record<string, number> = {};

  function drop(reason: string, detail: Record<string, unknown>) {
    dropped[reason] = (dropped[reason] ?? 0) + 1;
    logger.warn({ reason, ...detail }, "message dropped");
  }

  function route(topic: string, payload: Buffer) {
    const nowMs = options.now();
    const parsed = parseTopic(topic);
    if (!parsed) return drop("unknown_topic", { topic });
    if (parsed.kind === "controller") {
      const decoded = decode(wakePayload, payload);
      if (!decoded.ok) return drop("bad_wake", { topic, error: decoded.error });
      return handlers.wake(parsed.site, decoded.value);
    }
    const { site, device } = parsed;
    if (parsed.kind === "sensor") {
      const decoded = decode(readingPayload, payload);
      if (!decoded.ok) return drop("bad_reading", { sensor: `${site}/${device}`, error: decoded.error });
      const refused = handlers.reading(site, device, decoded.value, nowMs);
      return refused ? drop(refused, { device: `${site}/${device}` }) : undefined;
    }
    if (parsed.channel === "report") {
      const decoded = decode(reportPayload, payload);
      if (!decoded.ok) return drop("bad_report", { plug: `${site}/${device}`, error: decoded.error });
      const refused = handlers.report(site, device, decoded.value, nowMs);
      return refused ? drop(refused, { device: `${site}/${device}` }) : undefined;
    }
    if (parsed.channel === "presence") {
      const decoded = decode(presencePayload, payload);
      if (!decoded.ok) return drop("bad_presence", { plug: `${site}/${device}`, error: decoded.error });
      const refused = handlers.presence(site, device, decoded.value === "online", nowMs);
      return refused ? drop(refused, { device: `${site}/${device}` }) : undefined;
    }
    // Commands are ours; hearing them back is expected and ignored.
  }

  return {
    onMessage(topic: string, payload: Buffer) {
      try {
        route(topic, payload);
      } catch (error) {
        drop("handler_error", { topic, err: error });
      }
    },
    dropped: () => ({ ...dropped }),
  };
}
