// Commands on their way to the broker. During a tick they wait here and go out a few
// dozen at a time between turns of the event loop, so the broker (often in this
// process) starts delivering the first while the rest are written: an edge that
// switches every plug takes about as long as its slowest stage, not the sum of them.
import type { Logger } from "pino";
import type { BrokerLink } from "./link";

const CHUNK = 50;

export function createOutbox(options: { logger: Logger }) {
  const { logger } = options;
  let link: BrokerLink | null = null;
  const waiting: { topic: string; payload: string; deviceId: string }[] = [];
  let batching = false;
  let draining = false;
  let closed = false;

  function send(topic: string, payload: string, deviceId: string) {
    if (!link) return logger.warn({ plug: deviceId }, "command before the broker link is up; will retry");
    link.publish(topic, payload, (error) => logger.warn({ err: error, plug: deviceId }, "command publish failed; will retry"));
  }

  function drain() {
    draining = false;
    for (const command of waiting.splice(0, CHUNK)) send(command.topic, command.payload, command.deviceId);
    if (waiting.length > 0 && !closed) {
      draining = true;
      setImmediate(drain);
    }
  }

  return {
    /** The broker link commands go out on, once it is up. */
    attach(to: BrokerLink) {
      link = to;
    },
    publish(topic: string, payload: string, deviceId: string) {
      if (closed) return;
      if (!batching) return send(topic, payload, deviceId);
      waiting.push({ topic, payload, deviceId });
      if (waiting.length === CHUNK && !draining) drain();
    },
    /** Runs `work` with its commands batched, then starts sending what is left. */
    batch(work: () => void) {
      batching = true;
      try {
        work();
      } finally {
        batching = false;
      }
      if (!draining) drain();
    },
    close() {
      closed = true;
      waiting.length = 0;
    },
  };
}

export type Outbox = ReturnType<typeof createOutbox>;
