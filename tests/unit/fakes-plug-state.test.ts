import { describe, expect, it } from "vitest";
import {
  applyCommand,
  drawW,
  fallBack,
  initialPlugState,
  leaseExpired,
  meter,
  reportOf,
  resample,
  type PlugConfig,
} from "@/fakes/plug-state";
import { toReading } from "@/fakes/sensor-device";
import { readingPayload, reportPayload } from "@/lib/mqtt/topics";

const heater: PlugConfig = { ratedW: 2000, failsafeOn: false, meters: true };
const t0 = Date.parse("2026-01-15T06:00:00Z");

describe("plug state", () => {
  it("starts in its fail-safe state with no command", () => {
    expect(initialPlugState(heater, t0)).toMatchObject({ on: false, cmd: null, leaseUntilMs: null, watts: 0, wh: 0 });
    expect(initialPlugState({ ...heater, failsafeOn: true }, t0)).toMatchObject({ on: true, watts: 2000 });
  });

  it("obeys a command and holds it for the lease", () => {
    const s = applyCommand(heater, initialPlugState(heater, t0), { id: "c1", on: true, lease_s: 900 }, t0);
    expect(s).toMatchObject({ on: true, cmd: "c1", leaseUntilMs: t0 + 900_000, watts: 2000 });
    expect(leaseExpired(s, t0 + 900_000)).toBe(false);
    expect(leaseExpired(s, t0 + 900_001)).toBe(true);
  });

  it("renews the lease and echoes a repeated command", () => {
    const cmd = { id: "c1", on: true, lease_s: 60 };
    const a = applyCommand(heater, initialPlugState(heater, t0), cmd, t0);
    const b = applyCommand(heater, a, cmd, t0 + 30_000);
    expect(b.cmd).toBe("c1");
    expect(b.leaseUntilMs).toBe(t0 + 90_000);
  });

  it("falls back to its fail-safe state and forgets the command", () => {
    const on = applyCommand(heater, initialPlugState(heater, t0), { id: "c1", on: true, lease_s: 60 }, t0);
    const off = fallBack(heater, on, t0 + 61_000);
    expect(off).toMatchObject({ on: false, cmd: null, leaseUntilMs: null, watts: 0 });
    const keepsOn = fallBack({ ...heater, failsafeOn: true }, { ...on, on: false, watts: 0 }, t0 + 61_000);
    expect(keepsOn.on).toBe(true);
  });

  it("meters watt-hours over time", () => {
    // 2000 W for 30 min = 1000 Wh; off adds nothing; time running backwards adds nothing.
    let s = applyCommand(heater, initialPlugState(heater, t0), { id: "c1", on: true, lease_s: 3600 }, t0);
    s = meter(s, t0 + 1_800_000);
    expect(s.wh).toBeCloseTo(1000, 9);
    s = applyCommand(heater, s, { id: "c2", on: false, lease_s: 3600 }, t0 + 1_800_000);
    s = meter(s, t0 + 3_600_000);
    expect(s.wh).toBeCloseTo(1000, 9);
    expect(meter(s, t0).wh).toBe(s.wh);
  });

  it("draws the rated watts give or take 1.5 %, and nothing when off", () => {
    expect(drawW(heater, true, 1)).toBeCloseTo(2030, 9);
    expect(drawW(heater, true, -5)).toBeCloseTo(1970, 9);
    expect(drawW(heater, false, 1)).toBe(0);
    const s = applyCommand(heater, initialPlugState(heater, t0), { id: "c1", on: true, lease_s: 60 }, t0);
    expect(resample(heater, s, t0 + 1000, 0.5).watts).toBeCloseTo(2015, 9);
  });

  it("reports in the contract's shape, with nulls when it has no meter", () => {
    const s = applyCommand(heater, initialPlugState(heater, t0), { id: "c9", on: true, lease_s: 60 }, t0);
    const r = reportOf(heater, s, t0 + 36_000);
    expect(reportPayload.parse(r)).toEqual(r);
    expect(r).toEqual({ on: true, cmd: "c9", watts: 2000, wh: 20, at: "2026-01-15T06:00:36.000Z" });
    expect(reportOf({ ...heater, meters: false }, s, t0)).toMatchObject({ watts: null, wh: null });
  });
});

describe("sensor reading", () => {
  it("rounds to the sensor's resolution and fits the contract", () => {
    const r = toReading({ tempC: 12.34, rh: 81.26 }, t0, 0.9234, () => 0.5);
    expect(r).toEqual({ temp_c: 12.3, rh: 81.5, battery: 0.92, at: "2026-01-15T06:00:00.000Z" });
    expect(readingPayload.parse(r)).toEqual(r);
    expect(toReading({ tempC: 5, rh: 120 }, t0, 2, () => 1).rh).toBe(100);
    expect(toReading({ tempC: 5, rh: 120 }, t0, 2, () => 1).battery).toBe(1);
  });
});
