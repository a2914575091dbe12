import { describe, expect, it } from "vitest";
import { trafficSummary } from "@/lib/device-traffic-words";

describe("trafficSummary", () => {
  it("is null when the limits never acted", () => {
    expect(trafficSummary({ slowed: 0, oversized: 0, disconnected: 0 })).toBeNull();
  });

  it("says once and twice in words, more as a number", () => {
    expect(trafficSummary({ slowed: 1, oversized: 0, disconnected: 0 })).toBe("held back once");
    expect(trafficSummary({ slowed: 0, oversized: 0, disconnected: 2 })).toBe("cut off twice");
    expect(trafficSummary({ slowed: 12, oversized: 0, disconnected: 0 })).toBe("held back 12 times");
  });

  it("joins what happened, the last with “and”", () => {
    expect(trafficSummary({ slowed: 12, oversized: 0, disconnected: 2 })).toBe("held back 12 times and cut off twice");
    expect(trafficSummary({ slowed: 3, oversized: 1, disconnected: 1 })).toBe("held back 3 times, cut off once and refused 1 message as too large");
    expect(trafficSummary({ slowed: 0, oversized: 4, disconnected: 0 })).toBe("refused 4 messages as too large");
  });
});
