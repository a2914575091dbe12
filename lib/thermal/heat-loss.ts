// Heat loss of a house: conduction through the glazing plus the air that leaks out.
//
//   Q = U·A·ΔT + 0.33·V·N·ΔT   (watts; A in m², V in m³, N air changes per hour)
//
// The 0.33 is ρ·c/3600 for air (1.2 kg/m³ × 1005 J/kg·K ÷ 3600 s/h = 0.335), the form the
// extension services' greenhouse heating notes use (University of Georgia, Purdue).
// Heat lost through the floor to the ground is left out, as those notes do: it is small
// next to the glazing and the ground under a house is a store more than a sink.
import type { Glazing, HouseKind } from "../domain";
import { RIDGE_RULE, ridgeAboveEaves } from "../house-shape";

/** 1 Btu/h·ft²·°F in W/m²·K. */
export const BTU_H_FT2_F_IN_W_M2K = 5.678;

/** Volumetric heat capacity of air, J/m³·K (1.2 kg/m³ × 1005 J/kg·K). */
export const AIR_HEAT_CAPACITY_J_M3K = 1.2 * 1005;

/** ρ·c of air per hour: watts per (m³ × air change per hour × kelvin). */
export const AIR_EXCHANGE_W_PER_M3_ACH_K = AIR_HEAT_CAPACITY_J_M3K / 3600;

export type GlazingU = { u: number; source: string };

const btu = (value: number) => Math.round(value * BTU_H_FT2_F_IN_W_M2K * 100) / 100;

/**
 * Overall U-value (W/m²·K) of each glazing, with where it comes from. The single and
 * double ranges are the Extension Foundation's ("Farm Energy: Greenhouses — glazing
 * materials": single 1.0–1.2, double 0.6–0.7 Btu/h·ft²·°F).
 */
export const GLAZING_U: Record<Glazing, GlazingU> = {
  single_glass: {
    u: btu(1.1),
    source: "Extension Foundation, single glazing 1.0–1.2 Btu/h·ft²·°F: midpoint 1.1",
  },
  single_film: {
    u: btu(1.2),
    source: "Extension Foundation, single glazing 1.0–1.2 Btu/h·ft²·°F: upper end, thin film (from memory: tables put single poly at 1.15–1.2)",
  },
  single_rigid_plastic: {
    u: btu(1.0),
    source: "Extension Foundation, single glazing 1.0–1.2 Btu/h·ft²·°F: lower end, a thicker sheet (from memory)",
  },
  double_glass: {
    u: btu(0.65),
    source: "Extension Foundation, double glazing 0.6–0.7 Btu/h·ft²·°F: midpoint 0.65",
  },
  double_film_inflated: {
    u: btu(0.7),
    source: "Extension Foundation, double glazing 0.6–0.7 Btu/h·ft²·°F: upper end; common practice (from memory) quotes 0.7 for inflated double poly",
  },
  twin_wall_polycarbonate: {
    u: btu(0.62),
    source: "common practice, from memory: 8 mm twin-wall polycarbonate quoted at about 0.58–0.65 Btu/h·ft²·°F",
  },
};

export function glazingU(glazing: Glazing) {
  return GLAZING_U[glazing].u;
}

/** What the sums need of a house (the columns of the houses table). */
export type HouseShape = {
  kind: HouseKind;
  lengthM: number;
  widthM: number;
  /** Glasshouse: wall height at the eaves. Polytunnel: height of the hoops' shoulders. */
  eaveHeightM: number;
  ridgeHeightM: number;
  glazing: Glazing;
  airChangesPerHour: number;
};

export class HouseShapeError extends Error {}

function check(house: HouseShape) {
  const { lengthM, widthM, eaveHeightM, ridgeHeightM, airChangesPerHour } = house;
  for (const [name, v] of Object.entries({ lengthM, widthM, ridgeHeightM })) {
    if (!Number.isFinite(v) || v <= 0) throw new HouseShapeError(`${name} must be a positive number of metres`);
  }
  if (!Number.isFinite(eaveHeightM) || eaveHeightM < 0) throw new HouseShapeError("eaveHeightM must be zero or more");
  if (!ridgeAboveEaves(house)) throw new HouseShapeError(RIDGE_RULE.message);
  if (!Number.isFinite(airChangesPerHour) || airChangesPerHour < 0) throw new HouseShapeError("airChangesPerHour must be zero or more");
}

/** Perimeter of an ellipse with semi-axes a and b (Ramanujan's first approximation). */
function ellipsePerimeter(a: number, b: number) {
  return Math.PI * (3 * (a + b) - Math.sqrt((3 * a + b) * (a + 3 * b)));
}

/**
 * The cross-section of a house across its width: perimeter of the cover (floor
 * excluded) and the area of the section.
 *
 * - glasshouse, propagation house, other: upright walls to the eaves and a symmetric
 *   pitched roof from the eaves to a ridge along the length.
 * - polytunnel: upright legs to the shoulders and a half-ellipse from the shoulders to
 *   the ridge (semi-axes: half the width, ridge − shoulders). With the shoulders at
 *   the ground and the ridge at half the width this is the classic half-cylinder;
 *   real hoops with a shoulder are a little fuller, which the upright legs stand for.
 */
export function crossSection(house: HouseShape) {
  check(house);
  const half = house.widthM / 2;
  const rise = house.ridgeHeightM - house.eaveHeightM;
  const sides = 2 * house.eaveHeightM;
  if (house.kind === "polytunnel") {
    return {
      perimeterM: sides + ellipsePerimeter(half, rise) / 2,
      areaM2: house.widthM * house.eaveHeightM + (Math.PI * half * rise) / 2,
    };
  }
  return {
    perimeterM: sides + 2 * Math.hypot(half, rise),
    areaM2: house.widthM * house.eaveHeightM + half * rise,
  };
}

/** Glazed (heat-losing) surface: the cover along the length plus both end walls. */
export function glazedAreaM2(house: HouseShape) {
  const { perimeterM, areaM2 } = crossSection(house);
  return perimeterM * house.lengthM + 2 * areaM2;
}

export function floorAreaM2(house: HouseShape) {
  check(house);
  return house.lengthM * house.widthM;
}

export function airVolumeM3(house: HouseShape) {
  return crossSection(house).areaM2 * house.lengthM;
}

/** Watts lost per kelvin of inside-outside difference, split by path. */
export function heatLossCoefficients(house: HouseShape) {
  const conductionWK = glazingU(house.glazing) * glazedAreaM2(house);
  const airExchangeWK = AIR_EXCHANGE_W_PER_M3_ACH_K * airVolumeM3(house) * house.airChangesPerHour;
  return { conductionWK, airExchangeWK, totalWK: conductionWK + airExchangeWK };
}

export type HeatLoss = { conductionW: number; airExchangeW: number; totalW: number };

/** Heat flowing out at these temperatures (negative when outside is warmer). */
export function heatLoss(house: HouseShape, insideC: number, outsideC: number): HeatLoss {
  const k = heatLossCoefficients(house);
  const dT = insideC - outsideC;
  return { conductionW: k.conductionWK * dT, airExchangeW: k.airExchangeWK * dT, totalW: k.totalWK * dT };
}

export type HeaterSizing = HeatLoss & {
  /** The loss with the margin added, rounded up to the next `stepW`. */
  recommendedW: number;
};

/**
 * Heater output needed to hold `holdC` inside on a night at `designOutsideC` (no sun).
 * The margin covers wind, doors and an ageing cover; common practice, not a
 * published figure, is 10–20 %.
 */
export function sizeHeater(
  house: HouseShape,
  { holdC, designOutsideC, margin = 0.15, stepW = 100 }: { holdC: number; designOutsideC: number; margin?: number; stepW?: number },
): HeaterSizing {
  const loss = heatLoss(house, holdC, designOutsideC);
  const needed = Math.max(0, loss.totalW) * (1 + margin);
  return { ...loss, recommendedW: needed > 0 ? Math.ceil(needed / stepW - 1e-9) * stepW : 0 };
}
