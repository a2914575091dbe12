// Per-device limits on what a device may send to the broker: a token bucket for the
// rate, a cap on the size of one packet, and a cool-off after a device is cut off.
// Pure: every time is passed in.
import { MAX_PAYLOAD_BYTES } from "./topics";

export type TrafficLimits = {
  /** Messages a device may send at once after a quiet spell. */
  burst: number;
  /** Messages per second it may keep up. */
  perSecond: number;
  /** Held back without a break for this long, it is disconnected. */
  cutAfterMs: number;
  /** After a disconnection its sign-ins are refused for this long. */
  coolOffMs: number;
  /** Largest MQTT packet (its remaining length, in bytes) a device may send. */
  maxPacketBytes: number;
};

export type Admission =
  /** Send it on now. */
  | { action: "pass" }
  /** Send it on after `holdMs`, reading nothing more from the device meanwhile; `episode` when this starts a spell of holding back. */
  | { action: "hold"; holdMs: number; episode: boolean }
  /** Disconnect the device: it has been held back without a break for too long. */
  | { action: "cut" };

/** Every limit a positive number, the burst at least one message. */
export function checkTrafficLimits(limits: TrafficLimits): TrafficLimits {
  for (const [name, value] of Object.entries(limits)) {
    if (!Number.isFinite(value) || value <= 0) throw new RangeError(`traffic limit ${name} must be a positive number, not ${value}`);
  }
  if (limits.burst < 1) throw new RangeError(`traffic limit burst must be at least 1 message, not ${limits.burst}`);
  return limits;
}

/**
 * One device's bucket. A message takes a token; tokens come back at `perSecond` up
 * to `burst`. A message that finds none is let through once its token has come back
 * (the bucket goes into debt by one, so a device is never let through faster than its
 * rate) and the device is held back meanwhile. It is "held back without a break"
 * from the first such message until one finds a token waiting for it.
 */
export class TrafficBucket {
  private tokens: number;
  private atMs: number;
  private heldSinceMs: number | null = null;
  private coolOffUntilMs = Number.NEGATIVE_INFINITY;

  constructor(
    private readonly limits: TrafficLimits,
    nowMs: number,
  ) {
    this.tokens = limits.burst;
    this.atMs = nowMs;
  }

  /** What to do with the device's next message, arriving at `nowMs`. */
  admit(nowMs: number): Admission {
    const { burst, perSecond, cutAfterMs } = this.limits;
    // A clock that steps back gives nothing back and takes nothing away.
    const elapsedMs = Math.max(0, nowMs - this.atMs);
    this.tokens = Math.min(burst, this.tokens + (elapsedMs / 1000) * perSecond);
    this.atMs = Math.max(this.atMs, nowMs);
    if (this.tokens >= 1) {
      this.tokens -= 1;
      this.heldSinceMs = null;
      return { action: "pass" };
    }
    const episode = this.heldSinceMs === null;
    if (this.heldSinceMs === null) this.heldSinceMs = nowMs;
    if (nowMs - this.heldSinceMs >= cutAfterMs) {
      this.coolOff(nowMs);
      return { action: "cut" };
    }
    this.tokens -= 1;
    return { action: "hold", holdMs: Math.ceil((-this.tokens / perSecond) * 1000), episode };
  }

  /** Whether the device may sign in at `nowMs` (not while cooling off after a disconnection). */
  maySignIn(nowMs: number) {
    return nowMs >= this.coolOffUntilMs;
  }

  /** Whether the bucket is as a new one would be: full, not holding, not cooling off. */
  idle(nowMs: number) {
    const tokens = this.tokens + (Math.max(0, nowMs - this.atMs) / 1000) * this.limits.perSecond;
    return tokens >= this.limits.burst && this.maySignIn(nowMs);
  }

  /** Disconnected for another reason (a packet too large): the same cool-off. */
  coolOff(nowMs: number) {
    this.heldSinceMs = null;
    this.coolOffUntilMs = nowMs + this.limits.coolOffMs;
  }
}

/**
 * The limits every device gets unless the controller is told otherwise. From the device
 * contract (DESIGN.md): a sensor sends a reading every 30–60 s, a plug a report when
 * it switches and now and then besides, and a presence message when it comes and goes.
 * A device back on line may send what it queued while away all at once, hence a burst
 * of 20; 5 a second kept up is already some hundred times what any device needs, so
 * only a faulty device or a loop gets near it. Held back without a break for 10 s means
 * it is not catching up on a backlog; 30 s away gives it time to settle, then it may
 * try again. The figures are common practice, no published source.
 */
export const DEFAULT_DEVICE_LIMITS: TrafficLimits = {
  burst: 20,
  perSecond: 5,
  cutAfterMs: 10_000,
  coolOffMs: 30_000,
  // Four times the largest payload of the contract. A payload a little over it is the
  // controller's to drop and count as malformed, like any bad payload; one far over it
  // is a fault or worse, and is refused before the broker buffers it.
  maxPacketBytes: 4 * MAX_PAYLOAD_BYTES,
};
