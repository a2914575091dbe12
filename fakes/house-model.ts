// A lumped thermal model of one house: two temperatures, the air (with the light things
// in it: frames, leaves, the glazing's inner skin) and the thermal mass (floor, soil,
// pots, water butts). Heat comes from the appliances and the sun; it leaves through
// the cover and with leaking air at the rate lib/thermal/heat-loss.ts works out.
//
//   C_air·dT_air/dt  = P_in + f·S + UA·(T_out − T_air) + K·(T_mass − T_air)
//   C_mass·dT_mass/dt = (1 − f)·S + K·(T_air − T_mass)
//
// Each fixed step is solved implicitly (backward Euler), so any step length is stable
// and the steady state is exactly T_air = T_out + (P_in + S)/UA, the heat-loss balance.
import type { Glazing } from "../lib/domain";
import {
  AIR_HEAT_CAPACITY_J_M3K,
  airVolumeM3,
  floorAreaM2,
  heatLossCoefficients,
  type HouseShape,
} from "../lib/thermal/heat-loss";
import { DEFAULT_CLIMATE, saturationVapourPressureHPa, weatherAt, type Climate, type Weather } from "./weather";

/**
 * Share of the sun that gets through each cover (from memory, typical catalogue
 * figures for new material; dirt and condensation take more off).
 */
export const SOLAR_TRANSMITTANCE: Record<Glazing, number> = {
  single_glass: 0.88,
  double_glass: 0.78,
  single_film: 0.85,
  double_film_inflated: 0.75,
  twin_wall_polycarbonate: 0.78,
  single_rigid_plastic: 0.85,
};

export type HouseModelParams = {
  /** UA + 0.33·V·N: watts lost per kelvin (lib/thermal/heat-loss). */
  lossWK: number;
  airCapacityJK: number;
  massCapacityJK: number;
  /** Heat exchange between the air and the mass, W/K. */
  couplingWK: number;
  /** Floor area × transmittance: the sun's W/m² times this is the solar gain. */
  solarApertureM2: number;
  /** Share of the solar gain that warms the air directly; the rest lands on the mass. */
  solarToAir: number;
  /** Vapour the plants and damp soil add over the outside air's, hPa. */
  moistureHPa: number;
};

/** Invented sizes, chosen so that small houses respond within minutes and big ones slower. */
export const MODEL_DEFAULTS = {
  /** The air's own heat capacity times this stands for the light contents. */
  airContentsFactor: 3,
  /** J/m²·K of floor: about 5 cm of moist soil, or staging with pots and trays. */
  massPerFloorJM2K: 100_000,
  /** W/m²·K of floor between air and mass (convection plus radiation, lumped). */
  couplingPerFloorWM2K: 6,
  solarToAir: 0.3,
  moistureHPa: 2,
};

export function houseParams(house: HouseShape, overrides: Partial<typeof MODEL_DEFAULTS> = {}): HouseModelParams {
  const d = { ...MODEL_DEFAULTS, ...overrides };
  const floor = floorAreaM2(house);
  return {
    lossWK: heatLossCoefficients(house).totalWK,
    airCapacityJK: AIR_HEAT_CAPACITY_J_M3K * airVolumeM3(house) * d.airContentsFactor,
    massCapacityJK: floor * d.massPerFloorJM2K,
    couplingWK: floor * d.couplingPerFloorWM2K,
    solarApertureM2: floor * SOLAR_TRANSMITTANCE[house.glazing],
    solarToAir: d.solarToAir,
    moistureHPa: d.moistureHPa,
  };
}

export type HouseState = { airC: number; massC: number };

/** One implicit step of `dtS` seconds with constant weather and appliance heat. */
export function stepHouse(p: HouseModelParams, s: HouseState, weather: Weather, heatW: number, dtS: number): HouseState {
  const solarW = Math.max(0, weather.solarWm2) * p.solarApertureM2;
  const pAir = Math.max(0, heatW) + p.solarToAir * solarW;
  const pMass = (1 - p.solarToAir) * solarW;
  const ca = p.airCapacityJK / dtS;
  const cm = p.massCapacityJK / dtS;
  const L = p.lossWK;
  const K = p.couplingWK;
  const r1 = ca * s.airC + pAir + L * weather.outsideC;
  const r2 = cm * s.massC + pMass;
  const a11 = ca + L + K;
  const a22 = cm + K;
  const det = a11 * a22 - K * K;
  return { airC: (r1 * a22 + K * r2) / det, massC: (a11 * r2 + K * r1) / det };
}

/** Air temperature the house settles at with this heat and weather held for ever. */
export function steadyAirC(p: HouseModelParams, outsideC: number, heatW: number, solarWm2 = 0) {
  return outsideC + (Math.max(0, heatW) + Math.max(0, solarWm2) * p.solarApertureM2) / p.lossWK;
}

/**
 * Inside relative humidity, %: the outside air's vapour plus what the plants add,
 * capped where the cover would run with condensation.
 */
export function insideRh(p: HouseModelParams, airC: number, weather: Weather) {
  const outsideVapour = (saturationVapourPressureHPa(weather.outsideC) * weather.outsideRh) / 100;
  const saturated = saturationVapourPressureHPa(airC);
  return Math.min(98, (100 * (outsideVapour + p.moistureHPa)) / saturated);
}

export type HouseSnapshot = HouseState & { atMs: number; rh: number; heatW: number; weather: Weather };

export type SiteModelOptions = {
  timeZone: string;
  climate?: Partial<Climate>;
  seed?: number;
  startMs: number;
  /** Fixed step of simulated time. */
  stepMs?: number;
  houses: { id: string; params: HouseModelParams; initial?: Partial<HouseState> }[];
  /** Appliance heat in a house during the step that starts at `tMs`. */
  heatW: (houseId: string, tMs: number) => number;
};

/**
 * The houses of one site stepped together, so the weather (and its one luxon
 * conversion) is worked out once per step for all of them.
 */
export function createSiteModel(options: SiteModelOptions) {
  const climate: Climate = { ...DEFAULT_CLIMATE, ...options.climate };
  const seed = options.seed ?? 1;
  const stepMs = options.stepMs ?? 10_000;
  let atMs = options.startMs;
  let weather = weatherAt(climate, seed, atMs, options.timeZone);
  const houses = new Map(
    options.houses.map((h) => {
      const airC = h.initial?.airC ?? weather.outsideC;
      const state: HouseState = { airC, massC: h.initial?.massC ?? airC };
      return [h.id, { params: h.params, state, heatW: 0 }];
    }),
  );

  function snapshot(id: string): HouseSnapshot {
    const h = houses.get(id);
    if (!h) throw new Error(`no house ${id} in the model`);
    return { ...h.state, atMs, rh: insideRh(h.params, h.state.airC, weather), heatW: h.heatW, weather };
  }

  return {
    climate,
    get atMs() {
      return atMs;
    },
    get weather() {
      return weather;
    },
    houseIds: () => [...houses.keys()],
    snapshot,
    /** Steps whole steps up to `tMs`; time that does not fill a step waits for the next call. */
    advanceTo(tMs: number) {
      while (atMs + stepMs <= tMs) {
        for (const [id, h] of houses) {
          h.heatW = options.heatW(id, atMs);
          h.state = stepHouse(h.params, h.state, weather, h.heatW, stepMs / 1000);
        }
        atMs += stepMs;
        weather = weatherAt(climate, seed, atMs, options.timeZone);
      }
    },
  };
}

export type SiteModel = ReturnType<typeof createSiteModel>;
