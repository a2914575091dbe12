// The broker's per-device limits put to work: one bucket per device (kept across its
// reconnections, so coming back does not buy a fresh burst), a verdict for each packet
// a device sends, and each action counted, logged once and passed on.
import type { Client } from "aedes";
import type { Logger } from "pino";
import { deviceUsername, parseDeviceUsername, type Principal } from "@/lib/mqtt/credentials";
import { PACKET_CONNECT, PACKET_PUBLISH } from "@/lib/mqtt/frames";
import type { DeviceKind } from "@/lib/mqtt/topics";
import { TrafficBucket, type TrafficLimits } from "@/lib/mqtt/traffic-limit";
import type { GuardedPacket, Verdict } from "./traffic-guard";

export type LimitAction = "slowed" | "oversized" | "disconnected";

export type LimitEvent = { site: string; kind: DeviceKind; device: string; action: LimitAction; at: Date };

type Counts = { slowed: number; oversized: number; disconnected: number; refusedCoolingOff: number };
type Device = { site: string; kind: DeviceKind; device: string };

/** Buckets are swept of idle ones when there are more than this many. */
const SWEEP_ABOVE = 1000;

export function createTrafficJudge(options: {
  limits: TrafficLimits;
  counts: Counts;
  logger: Logger;
  onLimit?: (event: LimitEvent) => void;
  principalOf: (client: Client) => Principal | undefined;
  now?: () => number;
}) {
  const { limits, counts, logger } = options;
  const now = options.now ?? Date.now;
  const buckets = new Map<string, TrafficBucket>();

  function bucketOf(device: Device, nowMs: number) {
    const key = deviceUsername(device.site, device.kind, device.device);
    let bucket = buckets.get(key);
    if (!bucket) {
      if (buckets.size >= SWEEP_ABOVE) for (const [k, b] of buckets) if (b.idle(nowMs)) buckets.delete(k);
      bucket = new TrafficBucket(limits, nowMs);
      buckets.set(key, bucket);
    }
    return bucket;
  }

  function record(device: Device, action: LimitAction, nowMs: number, detail: Record<string, unknown>) {
    counts[action]++;
    logger.warn({ site: device.site, kind: device.kind, device: device.device, action, ...detail }, `device ${action} by the broker's limits`);
    try {
      options.onLimit?.({ ...device, action, at: new Date(nowMs) });
    } catch (error) {
      logger.error({ err: error }, "the broker's limit listener failed");
    }
  }

  /** The verdicts for one connection; `client` gives the broker's client once it has one. */
  function connection(client: () => Client | undefined) {
    /** The device this connection signed in as, once the broker has accepted it. */
    const signedIn = (): Device | "service" | null => {
      const c = client();
      const principal = c && options.principalOf(c);
      if (!principal) return null;
      return principal.kind === "controller" || principal.kind === "webapp" ? "service" : principal;
    };

    return (packet: GuardedPacket): Verdict => {
      const nowMs = now();
      if (packet.type === PACKET_CONNECT) {
        if (packet.remainingLength > limits.maxPacketBytes) {
          counts.oversized++;
          logger.warn({ bytes: packet.remainingLength }, "mqtt sign-in dropped: its packet is too large");
          return { action: "close" };
        }
        // A device cut off a moment ago waits out its cool-off before it may sign in.
        const claimed = packet.username ? parseDeviceUsername(packet.username) : null;
        if (claimed && claimed.kind !== "controller" && claimed.kind !== "webapp") {
          const bucket = buckets.get(deviceUsername(claimed.site, claimed.kind, claimed.device));
          if (bucket && !bucket.maySignIn(nowMs)) {
            counts.refusedCoolingOff++;
            return { action: "refuse" };
          }
        }
        return { action: "pass" };
      }
      const who = signedIn();
      if (who === "service") return { action: "pass" };
      if (packet.remainingLength > limits.maxPacketBytes) {
        if (who) {
          bucketOf(who, nowMs).coolOff(nowMs);
          record(who, "oversized", nowMs, { bytes: packet.remainingLength, limit: limits.maxPacketBytes });
        } else {
          counts.oversized++;
          logger.warn({ bytes: packet.remainingLength }, "mqtt packet too large before sign-in; connection dropped");
        }
        return { action: "close" };
      }
      // Before sign-in the broker itself queues only a few packets and drops the rest.
      if (packet.type !== PACKET_PUBLISH || !who) return { action: "pass" };
      const admission = bucketOf(who, nowMs).admit(nowMs);
      if (admission.action === "cut") {
        record(who, "disconnected", nowMs, { coolOffMs: limits.coolOffMs });
        return { action: "close" };
      }
      if (admission.action === "hold") {
        if (admission.episode) record(who, "slowed", nowMs, { perSecond: limits.perSecond, burst: limits.burst });
        return { action: "hold", holdMs: admission.holdMs };
      }
      return { action: "pass" };
    };
  }

  return { connection };
}
