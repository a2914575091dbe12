import { describe, expect, it } from "vitest";
import { createSiteModel, houseParams, insideRh, steadyAirC, stepHouse, type HouseState } from "@/fakes/house-model";
import type { Weather } from "@/fakes/weather";
import { heatLossCoefficients, type HouseShape } from "@/lib/thermal/heat-loss";

// The demo site's Seedling House and Orchard Tunnel (db/seed.ts).
const seedling: HouseShape = {
  kind: "propagation",
  lengthM: 6,
  widthM: 3.5,
  eaveHeightM: 2,
  ridgeHeightM: 2.8,
  glazing: "twin_wall_polycarbonate",
  airChangesPerHour: 0.8,
};
const tunnel: HouseShape = {
  kind: "polytunnel",
  lengthM: 20,
  widthM: 6,
  eaveHeightM: 1.6,
  ridgeHeightM: 3,
  glazing: "double_film_inflated",
  airChangesPerHour: 1,
};

const night: Weather = { outsideC: 5, outsideRh: 90, solarWm2: 0, sunElevationDeg: -20 };

function run(house: HouseShape, start: HouseState, heatW: number, minutes: number, weather = night) {
  const p = houseParams(house);
  let s = start;
  const trace: number[] = [];
  for (let i = 0; i < minutes * 6; i++) {
    s = stepHouse(p, s, weather, heatW, 10);
    trace.push(s.airC);
  }
  return { end: s, trace };
}

describe("house model", () => {
  it("warms the Seedling House by a few degrees within half an hour of its heater coming on", () => {
    const { end } = run(seedling, { airC: 5, massC: 5 }, 1000, 30);
    expect(end.airC - 5).toBeGreaterThan(2);
  });

  it("warms the big tunnel more slowly than the Seedling House for the same heater", () => {
    const small = run(seedling, { airC: 5, massC: 5 }, 2000, 10).end.airC;
    const big = run(tunnel, { airC: 5, massC: 5 }, 2000, 10).end.airC;
    expect(big).toBeLessThan(small);
    expect(big).toBeGreaterThan(5);
  });

  it("cools toward the outside temperature, never below it, with the heater off", () => {
    const { trace, end } = run(seedling, { airC: 18, massC: 16 }, 0, 24 * 60);
    for (let i = 1; i < trace.length; i++) expect(trace[i]!).toBeLessThanOrEqual(trace[i - 1]! + 1e-9);
    expect(end.airC).toBeGreaterThan(5);
    expect(end.airC).toBeLessThan(5.5);
  });

  it("settles where the heater's output balances the heat loss (cross-checks lib/thermal)", () => {
    // Steady state: Q_heater = (U·A + 0.33·V·N)·ΔT.
    const ua = heatLossCoefficients(seedling).totalWK;
    const { end } = run(seedling, { airC: 5, massC: 5 }, 1000, 5 * 24 * 60);
    expect(end.airC).toBeCloseTo(5 + 1000 / ua, 1);
    expect(end.massC).toBeCloseTo(end.airC, 1);
    expect(steadyAirC(houseParams(seedling), 5, 1000)).toBeCloseTo(5 + 1000 / ua, 9);
  });

  it("gains heat from the sun and none at night", () => {
    const sunny = { ...night, solarWm2: 200, sunElevationDeg: 15 };
    expect(run(seedling, { airC: 5, massC: 5 }, 0, 60, sunny).end.airC).toBeGreaterThan(7);
    expect(run(seedling, { airC: 5, massC: 5 }, 0, 60).end.airC).toBeCloseTo(5, 9);
  });

  it("is stable with long steps", () => {
    const p = houseParams(seedling);
    const s = stepHouse(p, { airC: 5, massC: 5 }, night, 1000, 30 * 24 * 3600);
    expect(s.airC).toBeCloseTo(steadyAirC(p, 5, 1000), 1);
  });

  it("ignores negative heater watts", () => {
    const p = houseParams(seedling);
    expect(stepHouse(p, { airC: 5, massC: 5 }, night, -500, 10).airC).toBeCloseTo(5, 9);
  });
});

describe("inside humidity", () => {
  it("rises as the air cools and stays within 0–98 %", () => {
    const p = houseParams(seedling);
    const warm = insideRh(p, 20, night);
    const cool = insideRh(p, 10, night);
    expect(cool).toBeGreaterThan(warm);
    expect(insideRh(p, 5, night)).toBeLessThanOrEqual(98);
    expect(warm).toBeGreaterThan(20);
  });
});

describe("site model", () => {
  const start = Date.parse("2026-01-15T00:00:00Z");
  const make = (heatOn: (t: number) => boolean, seed = 7) =>
    createSiteModel({
      timeZone: "Europe/London",
      seed,
      startMs: start,
      houses: [{ id: "seedling", params: houseParams(seedling) }],
      heatW: (_id, t) => (heatOn(t) ? 1000 : 0),
    });

  it("is deterministic for a seed", () => {
    const a = make(() => true);
    const b = make(() => true);
    a.advanceTo(start + 6 * 3600_000);
    b.advanceTo(start + 3 * 3600_000);
    b.advanceTo(start + 6 * 3600_000);
    expect(a.snapshot("seedling")).toEqual(b.snapshot("seedling"));
    const c = make(() => true, 8);
    c.advanceTo(start + 6 * 3600_000);
    expect(c.snapshot("seedling").airC).not.toBe(a.snapshot("seedling").airC);
  });

  it("runs warmer with the heater on than off", () => {
    const on = make(() => true);
    const off = make(() => false);
    on.advanceTo(start + 2 * 3600_000);
    off.advanceTo(start + 2 * 3600_000);
    expect(on.snapshot("seedling").airC - off.snapshot("seedling").airC).toBeGreaterThan(2);
    expect(on.snapshot("seedling").heatW).toBe(1000);
  });

  it("steps whole steps only and keeps the remainder for later", () => {
    const m = make(() => false);
    m.advanceTo(start + 25_000);
    expect(m.atMs).toBe(start + 20_000);
    m.advanceTo(start + 30_000);
    expect(m.atMs).toBe(start + 30_000);
  });

  it("refuses a house it does not know", () => {
    expect(() => make(() => false).snapshot("nope")).toThrow();
  });
});
