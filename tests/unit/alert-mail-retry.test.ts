// The outbox's back-off: 30 s after the first failure, doubling up to 15 min, given up a
// day after the e-mail was written (the project's own policy; no published source).
import { describe, expect, it } from "vitest";
import { DEFAULT_RETRY_POLICY, afterFailure, retryDelayMs } from "@/lib/alerts/retry";

describe("retry back-off", () => {
  it("doubles from 30 s and stops growing at 15 min", () => {
    expect([1, 2, 3, 4, 5, 6, 7, 50].map((n) => retryDelayMs(n) / 1000)).toEqual([30, 60, 120, 240, 480, 900, 900, 900]);
  });

  it("refuses a count of attempts that is not one", () => {
    expect(() => retryDelayMs(0)).toThrow(RangeError);
    expect(() => retryDelayMs(1.5)).toThrow(RangeError);
  });

  it("follows a policy given to it", () => {
    expect(retryDelayMs(3, { firstDelayMs: 1000, maxDelayMs: 3000, giveUpAfterMs: 60_000 })).toBe(3000);
  });

  it("tries again after the back-off until a day has passed since the e-mail was written", () => {
    const writtenAt = new Date("2026-12-03T10:00:00Z");
    const now = new Date("2026-12-03T10:05:00Z");
    expect(afterFailure({ attempts: 2, writtenAt, now })).toEqual({ giveUp: false, retryAt: new Date("2026-12-03T10:06:00Z") });
    const almost = new Date(writtenAt.getTime() + DEFAULT_RETRY_POLICY.giveUpAfterMs - 1);
    expect(afterFailure({ attempts: 90, writtenAt, now: almost }).giveUp).toBe(false);
    expect(afterFailure({ attempts: 91, writtenAt, now: new Date(writtenAt.getTime() + DEFAULT_RETRY_POLICY.giveUpAfterMs) })).toEqual({ giveUp: true });
  });
});
