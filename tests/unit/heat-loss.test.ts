import { describe, expect, it } from "vitest";
import {
  AIR_EXCHANGE_W_PER_M3_ACH_K,
  BTU_H_FT2_F_IN_W_M2K,
  GLAZING_U,
  HouseShapeError,
  airVolumeM3,
  crossSection,
  glazedAreaM2,
  heatLoss,
  heatLossCoefficients,
  sizeHeater,
  type HouseShape,
} from "@/lib/thermal/heat-loss";
import { GLAZINGS } from "@/lib/domain";

const box: HouseShape = {
  kind: "glasshouse",
  lengthM: 3,
  widthM: 2,
  eaveHeightM: 2,
  ridgeHeightM: 2,
  glazing: "single_glass",
  airChangesPerHour: 1,
};

describe("constants", () => {
  it("derives the 0.33 air-exchange factor from air's density and heat capacity", () => {
    // Derived (REFERENCES.md, extension greenhouse notes): 1.2 kg/m³ × 1005 J/kg·K / 3600 s/h.
    expect(AIR_EXCHANGE_W_PER_M3_ACH_K).toBeCloseTo(0.335, 3);
    expect(AIR_EXCHANGE_W_PER_M3_ACH_K).toBeCloseTo(0.33, 1);
  });

  it("converts Btu/h·ft²·°F to W/m²·K", () => {
    // 1 Btu/h = 0.29307 W, 1 ft² = 0.092903 m², 1 °F = 5/9 K → 5.678 W/m²·K (unit definitions).
    expect(0.29307107 / 0.09290304 / (5 / 9)).toBeCloseTo(BTU_H_FT2_F_IN_W_M2K, 3);
  });

  it("keeps single glazing in 5.7–6.8 W/m²K and double in 3.4–4.0", () => {
    // Extension Foundation, "Farm Energy: Greenhouses — glazing materials".
    for (const g of ["single_glass", "single_film", "single_rigid_plastic"] as const) {
      expect(GLAZING_U[g].u).toBeGreaterThanOrEqual(5.67);
      expect(GLAZING_U[g].u).toBeLessThanOrEqual(6.82);
    }
    for (const g of ["double_glass", "double_film_inflated", "twin_wall_polycarbonate"] as const) {
      expect(GLAZING_U[g].u).toBeGreaterThanOrEqual(3.4);
      expect(GLAZING_U[g].u).toBeLessThanOrEqual(4.0);
    }
    for (const g of GLAZINGS) expect(GLAZING_U[g].source).not.toBe("");
  });

  it("makes double glazing lose roughly 35 % less than single", () => {
    // Extension Foundation: double glazing cuts heat loss by roughly 35 %.
    const saving = 1 - GLAZING_U.double_glass.u / GLAZING_U.single_glass.u;
    expect(saving).toBeGreaterThan(0.3);
    expect(saving).toBeLessThan(0.45);
  });
});

describe("geometry", () => {
  it("works out a 3 m × 2 m × 2 m box by hand", () => {
    // Hand-worked: long walls 2 × 3 × 2 = 12, end walls 2 × 2 × 2 = 8, roof 3 × 2 = 6 → 26 m²; V = 12 m³.
    expect(glazedAreaM2(box)).toBeCloseTo(26, 9);
    expect(airVolumeM3(box)).toBeCloseTo(12, 9);
  });

  it("adds a pitched roof and gable triangles to a glasshouse", () => {
    // Hand-worked: 4 m wide, eaves 2 m, ridge 3 m → slopes √(2² + 1²) = 2.236 m each;
    // section 4 × 2 + ½ × 4 × 1 = 10 m²; perimeter 2 + 2 + 2 × 2.236 = 8.472 m.
    const house = { ...box, lengthM: 5, widthM: 4, ridgeHeightM: 3 };
    const s = crossSection(house);
    expect(s.perimeterM).toBeCloseTo(4 + 2 * Math.sqrt(5), 9);
    expect(s.areaM2).toBeCloseTo(10, 9);
    expect(glazedAreaM2(house)).toBeCloseTo(5 * (4 + 2 * Math.sqrt(5)) + 20, 9);
    expect(airVolumeM3(house)).toBeCloseTo(50, 9);
  });

  it("makes a polytunnel without shoulders a half-cylinder", () => {
    // Geometry: half a circle of radius r has arc πr and area πr²/2.
    const tunnel: HouseShape = { ...box, kind: "polytunnel", lengthM: 10, widthM: 4, eaveHeightM: 0, ridgeHeightM: 2 };
    expect(crossSection(tunnel).perimeterM).toBeCloseTo(2 * Math.PI, 9);
    expect(airVolumeM3(tunnel)).toBeCloseTo(10 * 2 * Math.PI, 9);
    expect(glazedAreaM2(tunnel)).toBeCloseTo(10 * 2 * Math.PI + 4 * Math.PI, 9);
  });

  it("gives a tunnel with shoulders more cover than the half-ellipse alone", () => {
    const low: HouseShape = { ...box, kind: "polytunnel", lengthM: 20, widthM: 6, eaveHeightM: 0, ridgeHeightM: 1.4 };
    const high = { ...low, eaveHeightM: 1.6, ridgeHeightM: 3 };
    expect(glazedAreaM2(high)).toBeGreaterThan(glazedAreaM2(low));
    expect(crossSection(high).perimeterM - crossSection(low).perimeterM).toBeCloseTo(3.2, 9);
  });

  it("refuses impossible shapes", () => {
    expect(() => glazedAreaM2({ ...box, ridgeHeightM: 1 })).toThrow(HouseShapeError);
    expect(() => glazedAreaM2({ ...box, widthM: 0 })).toThrow(HouseShapeError);
    expect(() => glazedAreaM2({ ...box, lengthM: Number.NaN })).toThrow(HouseShapeError);
    expect(() => heatLoss({ ...box, airChangesPerHour: -1 }, 10, 0)).toThrow(HouseShapeError);
  });
});

describe("heat loss", () => {
  it("matches a hand-worked loss for the box", () => {
    // Q = U·A·ΔT + 0.335·V·N·ΔT with U = 6.25 (1.1 Btu/h·ft²·°F), A = 26, V = 12, N = 1, ΔT = 10:
    // 6.25 × 26 × 10 = 1625 W, 0.335 × 12 × 10 = 40.2 W.
    const q = heatLoss(box, 15, 5);
    expect(GLAZING_U.single_glass.u).toBe(6.25);
    expect(q.conductionW).toBeCloseTo(1625, 6);
    expect(q.airExchangeW).toBeCloseTo(40.2, 6);
    expect(q.totalW).toBeCloseTo(1665.2, 6);
  });

  it("matches the imperial form 0.018·V·N·ΔT Btu/h for air exchange", () => {
    // Extension greenhouse notes (REFERENCES.md): Q = 0.018·V·N·ΔT Btu/h, V in ft³, ΔT in °F.
    const house = { ...box, airChangesPerHour: 2 };
    const vFt3 = airVolumeM3(house) / 0.0283168;
    const btuH = 0.018 * vFt3 * 2 * (10 * 9) / 5;
    expect(heatLoss(house, 10, 0).airExchangeW).toBeCloseTo(btuH * 0.29307107, -1);
  });

  it("is zero with no difference and gains when outside is warmer", () => {
    expect(heatLoss(box, 8, 8).totalW).toBe(0);
    expect(heatLoss(box, 5, 8).totalW).toBeLessThan(0);
  });

  it("splits the coefficient into conduction and air exchange", () => {
    const k = heatLossCoefficients(box);
    expect(k.totalWK).toBeCloseTo(k.conductionWK + k.airExchangeWK, 9);
    expect(k.totalWK * 10).toBeCloseTo(heatLoss(box, 10, 0).totalW, 9);
  });
});

describe("heater sizing", () => {
  it("sizes for the design night with a margin, rounded up", () => {
    // 1665.2 W at ΔT 10 K; × 1.15 = 1915 W → 2000 W.
    const s = sizeHeater(box, { holdC: 7, designOutsideC: -3 });
    expect(s.totalW).toBeCloseTo(1665.2, 6);
    expect(s.recommendedW).toBe(2000);
    expect(sizeHeater(box, { holdC: 7, designOutsideC: -3, margin: 0, stepW: 1 }).recommendedW).toBe(1666);
  });

  it("needs nothing when the night is warmer than the target", () => {
    expect(sizeHeater(box, { holdC: 5, designOutsideC: 10 }).recommendedW).toBe(0);
  });
});
