import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DEFAULT_DEVICE_LIMITS, TrafficBucket, checkTrafficLimits, type TrafficLimits } from "@/lib/mqtt/traffic-limit";
import { connectUsername, readFixedHeader } from "@/lib/mqtt/frames";

const limits: TrafficLimits = { burst: 3, perSecond: 2, cutAfterMs: 5000, coolOffMs: 30_000, maxPacketBytes: 100 };

describe("TrafficBucket", () => {
  it("lets a burst through at once, then holds each further message until its token is back", () => {
    const bucket = new TrafficBucket(limits, 0);
    expect([bucket.admit(0), bucket.admit(0), bucket.admit(0)]).toEqual(Array(3).fill({ action: "pass" }));
    // 2 a second: the 4th waits 500 ms, the 5th (arriving at once) 1000 ms.
    expect(bucket.admit(0)).toEqual({ action: "hold", holdMs: 500, episode: true });
    expect(bucket.admit(0)).toEqual({ action: "hold", holdMs: 1000, episode: false });
  });

  it("counts a spell of holding back once, and a new one after the device kept within its rate", () => {
    const bucket = new TrafficBucket(limits, 0);
    for (let i = 0; i < 3; i++) bucket.admit(0);
    expect(bucket.admit(0)).toMatchObject({ action: "hold", episode: true });
    // Let through at 500 ms; the next at 500 ms finds no token: still the same spell.
    expect(bucket.admit(500)).toMatchObject({ action: "hold", episode: false });
    // Quiet for a while: a message finds a token, the spell is over.
    expect(bucket.admit(5000)).toEqual({ action: "pass" });
    for (let i = 0; i < 2; i++) bucket.admit(5000);
    expect(bucket.admit(5000)).toMatchObject({ action: "hold", episode: true });
  });

  it("never holds a device that keeps to its rate, however long", () => {
    const bucket = new TrafficBucket(limits, 0);
    for (let t = 0; t < 600_000; t += 500) expect(bucket.admit(t)).toEqual({ action: "pass" });
  });

  it("cuts off a device held back without a break for cutAfterMs, then refuses its sign-ins for the cool-off", () => {
    const bucket = new TrafficBucket(limits, 0);
    let t = 0;
    let verdict = bucket.admit(t);
    // A device with a backlog: each message arrives the moment the last was let through.
    while (verdict.action !== "cut") {
      if (verdict.action === "hold") t += verdict.holdMs;
      verdict = bucket.admit(t);
    }
    // The first hold came at t = 0 (after the burst), the cut at the first message 5 s on.
    expect(t).toBe(5000);
    expect(bucket.maySignIn(t)).toBe(false);
    expect(bucket.maySignIn(t + 29_999)).toBe(false);
    expect(bucket.maySignIn(t + 30_000)).toBe(true);
  });

  it("lets through no more than the burst plus the rate over any span (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 400 }), { minLength: 1, maxLength: 300 }), (gaps) => {
        const bucket = new TrafficBucket({ ...limits, cutAfterMs: Number.MAX_SAFE_INTEGER }, 0);
        // Each message is sent `gap` ms after the previous one was let through.
        let t = 0;
        for (const gap of gaps) {
          t += gap;
          const verdict = bucket.admit(t);
          if (verdict.action === "hold") t += verdict.holdMs;
        }
        // gaps.length messages let through by t: at most burst + rate × t (+1 for rounding up of holds).
        expect(gaps.length).toBeLessThanOrEqual(limits.burst + (t / 1000) * limits.perSecond + 1);
      }),
    );
  });

  it("takes a clock stepping back as no time passed", () => {
    const bucket = new TrafficBucket(limits, 10_000);
    for (let i = 0; i < 3; i++) bucket.admit(10_000);
    expect(bucket.admit(0)).toMatchObject({ action: "hold", holdMs: 500 });
  });

  it("is idle again once full and past its cool-off", () => {
    const bucket = new TrafficBucket(limits, 0);
    bucket.admit(0);
    expect(bucket.idle(0)).toBe(false);
    expect(bucket.idle(500)).toBe(true);
    bucket.coolOff(500);
    expect(bucket.idle(1000)).toBe(false);
    expect(bucket.idle(30_500)).toBe(true);
  });
});

describe("checkTrafficLimits", () => {
  it("accepts the defaults", () => {
    expect(checkTrafficLimits(DEFAULT_DEVICE_LIMITS)).toBe(DEFAULT_DEVICE_LIMITS);
  });
  it("says which limit is wrong", () => {
    expect(() => checkTrafficLimits({ ...limits, perSecond: 0 })).toThrow("traffic limit perSecond must be a positive number, not 0");
    expect(() => checkTrafficLimits({ ...limits, maxPacketBytes: Number.NaN })).toThrow("maxPacketBytes");
    expect(() => checkTrafficLimits({ ...limits, burst: 0.5 })).toThrow("burst must be at least 1 message");
  });
});

describe("readFixedHeader", () => {
  // MQTT 3.1.1 §2.2.3 gives these remaining-length encodings.
  it.each([
    [[0x30, 0x00], 0, 2],
    [[0x30, 0x7f], 127, 2],
    [[0x30, 0x80, 0x01], 128, 3],
    [[0x30, 0xff, 0x7f], 16_383, 3],
    [[0x30, 0x80, 0x80, 0x01], 16_384, 4],
    [[0x30, 0xff, 0xff, 0xff, 0x7f], 268_435_455, 5],
  ])("reads %j as %i bytes after a %i-byte header", (bytes, remainingLength, headerLength) => {
    expect(readFixedHeader(Uint8Array.from(bytes))).toEqual({ type: 3, remainingLength, headerLength });
  });

  it("asks for more bytes, and refuses a fifth length byte", () => {
    expect(readFixedHeader(Uint8Array.from([0x30]))).toBe("incomplete");
    expect(readFixedHeader(Uint8Array.from([0x30, 0x80, 0x80]))).toBe("incomplete");
    expect(readFixedHeader(Uint8Array.from([0x30, 0x80, 0x80, 0x80, 0x80, 0x01]))).toBe("malformed");
  });

  it("reads at an offset", () => {
    expect(readFixedHeader(Uint8Array.from([0, 0, 0x10, 0x05]), 2)).toEqual({ type: 1, remainingLength: 5, headerLength: 2 });
  });
});

function connectPacket(fields: { clientId: string; username?: string; will?: [string, string]; password?: string }) {
  const str = (s: string) => {
    const b = Buffer.from(s);
    return Buffer.concat([Buffer.from([b.length >> 8, b.length & 0xff]), b]);
  };
  const flags = (fields.username !== undefined ? 0x80 : 0) | (fields.password !== undefined ? 0x40 : 0) | (fields.will ? 0x04 : 0) | 0x02;
  const body = Buffer.concat([
    str("MQTT"),
    Buffer.from([4, flags, 0, 60]),
    str(fields.clientId),
    ...(fields.will ? [str(fields.will[0]), str(fields.will[1])] : []),
    ...(fields.username !== undefined ? [str(fields.username)] : []),
    ...(fields.password !== undefined ? [str(fields.password)] : []),
  ]);
  return Buffer.concat([Buffer.from([0x10, body.length]), body]);
}

describe("connectUsername", () => {
  it("finds the user name, past a will", () => {
    expect(connectUsername(connectPacket({ clientId: "c1", username: "site-a:sensor:air-1", password: "x" }))).toBe("site-a:sensor:air-1");
    expect(connectUsername(connectPacket({ clientId: "", will: ["t/p", "offline"], username: "site-a:plug:heater-1", password: "x" }))).toBe("site-a:plug:heater-1");
  });

  it("is null without one, for a cut-short packet, or for another packet type", () => {
    expect(connectUsername(connectPacket({ clientId: "c1" }))).toBeNull();
    const whole = connectPacket({ clientId: "c1", username: "site-a:sensor:air-1" });
    expect(connectUsername(whole.subarray(0, whole.length - 3))).toBeNull();
    const lying = Buffer.from(whole);
    lying[lying.length - 20] = 0xff; // a field length running past the end
    expect(connectUsername(lying)).toBeNull();
    expect(connectUsername(Uint8Array.from([0x30, 0x00]))).toBeNull();
  });
});
