import { describe, expect, it } from "vitest";
import { CONTROLLER_SILENT_AFTER_MS, isControllerRunning } from "@/lib/control/heartbeat";

describe("isControllerRunning", () => {
  const now = new Date("2026-02-01T08:00:00.000Z");
  const ago = (ms: number) => new Date(now.getTime() - ms);

  it("is false when no controller has ever beaten", () => {
    expect(isControllerRunning(null, now)).toBe(false);
  });

  it("allows four missed 5 s beats, not more", () => {
    expect(CONTROLLER_SILENT_AFTER_MS).toBe(20_000);
    expect(isControllerRunning(ago(5_000), now)).toBe(true);
    expect(isControllerRunning(ago(20_000), now)).toBe(true);
    expect(isControllerRunning(ago(20_001), now)).toBe(false);
    expect(isControllerRunning(ago(3_600_000), now)).toBe(false);
  });

  it("takes a beat slightly ahead of this clock as running", () => {
    expect(isControllerRunning(new Date(now.getTime() + 1500), now)).toBe(true);
  });
});
