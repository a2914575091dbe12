import { describe, expect, it } from "vitest";
import {
  absoluteHumidityGM3,
  dewPointC,
  saturationVapourPressureKPa,
  vapourPressureDeficitKPa,
  vapourPressureKPa,
} from "@/lib/psychrometrics";

const relativeError = (value: number, reference: number) => Math.abs(value - reference) / reference;

describe("saturation vapour pressure", () => {
  // CRC Handbook of Chemistry and Physics, "Vapor pressure of water" table (as quoted in
  // ../shared/REFERENCES.md): 0 °C 0.6113, 10 °C 1.2281, 20 °C 2.3388, 30 °C 4.2455 kPa.
  // Alduchov & Eskridge (1996) give their Magnus fit as within about 0.3 % of it here.
  it.each([
    [0, 0.6113],
    [10, 1.2281],
    [20, 2.3388],
    [30, 4.2455],
  ])("at %s °C is within 0.3 %% of the CRC table value %s kPa", (tempC, table) => {
    expect(relativeError(saturationVapourPressureKPa(tempC)!, table)).toBeLessThan(0.003);
  });

  it("agrees with FAO-56's own formula and its worked example at 15 °C", () => {
    // FAO Irrigation and Drainage Paper 56, ch. 3, eq. 11: e°(T) = 0.6108·exp(17.27·T/(T+237.3)) kPa,
    // and its table/worked value e°(15 °C) = 1.705 kPa.
    const fao = (t: number) => 0.6108 * Math.exp((17.27 * t) / (t + 237.3));
    expect(fao(15)).toBeCloseTo(1.705, 3);
    expect(relativeError(saturationVapourPressureKPa(15)!, 1.705)).toBeLessThan(0.003);
    for (let t = 0; t <= 40; t += 5) expect(relativeError(saturationVapourPressureKPa(t)!, fao(t))).toBeLessThan(0.003);
  });

  it("rises with temperature", () => {
    let last = 0;
    for (let t = -40; t <= 60; t += 0.5) {
      const es = saturationVapourPressureKPa(t)!;
      expect(es).toBeGreaterThan(last);
      last = es;
    }
  });
});

describe("dew point", () => {
  it("is about 9.3 °C at 20 °C and 50 % RH", () => {
    // REFERENCES.md (Magnus inversion; standard dew-point tables agree to about 0.1 °C).
    expect(dewPointC(20, 50)).toBeCloseTo(9.3, 1);
  });

  it("equals the air temperature at saturation and inverts the vapour pressure", () => {
    // Follows from the definition (dew point: the temperature at which e = es); no outside value.
    for (const t of [-10, 0, 12.5, 35]) {
      expect(dewPointC(t, 100)).toBeCloseTo(t, 9);
      for (const rh of [15, 60, 95]) {
        const td = dewPointC(t, rh)!;
        expect(td).toBeLessThan(t);
        expect(saturationVapourPressureKPa(td)).toBeCloseTo(vapourPressureKPa(t, rh)!, 9);
      }
    }
  });
});

describe("vapour pressure deficit", () => {
  it("is es·(1 − RH/100)", () => {
    // REFERENCES.md: VPD = es(T)·(1 − RH/100); with the CRC value at 20 °C, 60 % RH ≈ 0.935 kPa.
    expect(vapourPressureDeficitKPa(20, 60)).toBeCloseTo(0.4 * saturationVapourPressureKPa(20)!, 12);
    expect(relativeError(vapourPressureDeficitKPa(20, 60)!, 0.4 * 2.3388)).toBeLessThan(0.003);
    expect(vapourPressureDeficitKPa(20, 100)).toBe(0);
  });
});

describe("absolute humidity", () => {
  it("is the saturated vapour density at 100 % RH", () => {
    // From memory: the density of saturated water vapour is about 17.3 g/m³ at 20 °C and
    // 30.4 g/m³ at 30 °C (the usual table of saturated vapour density, e.g. in the CRC
    // Handbook). The ideal gas law with the Magnus pressure lands within 0.5 %.
    expect(relativeError(absoluteHumidityGM3(20, 100)!, 17.3)).toBeLessThan(0.005);
    expect(relativeError(absoluteHumidityGM3(30, 100)!, 30.4)).toBeLessThan(0.005);
  });

  it("scales with relative humidity", () => {
    expect(absoluteHumidityGM3(15, 40)! * 2).toBeCloseTo(absoluteHumidityGM3(15, 80)!, 9);
    expect(absoluteHumidityGM3(15, 0)).toBe(0);
  });
});

describe("inputs that cannot be trusted give null", () => {
  it.each([
    ["NaN temperature", Number.NaN, 50],
    ["infinite temperature", Number.POSITIVE_INFINITY, 50],
    ["temperature below −40 °C", -40.1, 50],
    ["temperature above 60 °C", 60.1, 50],
    ["NaN humidity", 20, Number.NaN],
    ["humidity below 0 %", 20, -0.1],
    ["humidity above 100 %", 20, 100.1],
    ["missing temperature", null, 50],
    ["missing humidity", 20, null],
  ] as const)("%s", (_what, tempC, rh) => {
    expect(dewPointC(tempC, rh)).toBeNull();
    expect(vapourPressureDeficitKPa(tempC, rh)).toBeNull();
    expect(absoluteHumidityGM3(tempC, rh)).toBeNull();
  });

  it("a dry 0 % has no dew point, but a deficit and a humidity of 0", () => {
    expect(dewPointC(20, 0)).toBeNull();
    expect(vapourPressureDeficitKPa(20, 0)).toBeCloseTo(saturationVapourPressureKPa(20)!, 12);
  });

  it("the bounds themselves are accepted", () => {
    expect(saturationVapourPressureKPa(-40)).not.toBeNull();
    expect(saturationVapourPressureKPa(60)).not.toBeNull();
    expect(saturationVapourPressureKPa(Number.NaN)).toBeNull();
  });
});
