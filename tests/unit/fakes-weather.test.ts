import { describe, expect, it } from "vitest";
import {
  DEFAULT_CLIMATE,
  dailyShape,
  daylight,
  irradianceWm2,
  localSolarTime,
  saturationVapourPressureHPa,
  seasonalMeanC,
  weatherAt,
} from "@/fakes/weather";
import { sequence, smoothNoise, unit } from "@/fakes/random";

const HOUR = 3_600_000;

describe("saturation vapour pressure", () => {
  it("is within 0.3 % of the CRC Handbook table between 0 and 30 °C", () => {
    // CRC Handbook of Chemistry and Physics (REFERENCES.md): kPa at 0, 10, 20, 30 °C;
    // Magnus with Alduchov & Eskridge (1996) coefficients.
    for (const [t, kPa] of [
      [0, 0.6113],
      [10, 1.2281],
      [20, 2.3388],
      [30, 4.2455],
    ] as const) {
      expect(Math.abs(saturationVapourPressureHPa(t) / 10 / kPa - 1)).toBeLessThan(0.003);
    }
  });
});

describe("weather", () => {
  it("keeps the day's shape at -1 before dawn and +1 mid-afternoon", () => {
    expect(dailyShape(7, 7, 14.5)).toBeCloseTo(-1, 9);
    expect(dailyShape(14.5, 7, 14.5)).toBeCloseTo(1, 9);
    expect(dailyShape(31, 7, 14.5)).toBeCloseTo(-1, 9);
    expect(Math.abs(dailyShape(20, 7, 14.5))).toBeLessThan(1);
  });

  it("gives London short winter days and long summer days", () => {
    // Common knowledge: about 8 h of daylight at the winter solstice and 16.5 h at midsummer at 51.5° N.
    const winter = daylight(51.5, 355);
    const summer = daylight(51.5, 172);
    expect(winter.sunset - winter.sunrise).toBeGreaterThan(7.5);
    expect(winter.sunset - winter.sunrise).toBeLessThan(8.3);
    expect(summer.sunset - summer.sunrise).toBeGreaterThan(16);
    expect(summer.sunset - summer.sunrise).toBeLessThan(16.8);
  });

  it("has no sun at night and some by day", () => {
    expect(irradianceWm2(-5, 0)).toBe(0);
    expect(irradianceWm2(30, 0)).toBeGreaterThan(irradianceWm2(30, 1));
    const noon = weatherAt(DEFAULT_CLIMATE, 1, Date.parse("2026-01-15T12:00:00Z"), "Europe/London");
    const midnight = weatherAt(DEFAULT_CLIMATE, 1, Date.parse("2026-01-15T00:00:00Z"), "Europe/London");
    expect(noon.solarWm2).toBeGreaterThan(20);
    expect(midnight.solarWm2).toBe(0);
  });

  it("reads the wall clock in the site's zone, summer time removed", () => {
    expect(localSolarTime(Date.parse("2026-07-01T12:00:00Z"), "Europe/London").solarHour).toBeCloseTo(12, 9);
    expect(localSolarTime(Date.parse("2026-01-01T12:00:00Z"), "Australia/Sydney").solarHour).toBeCloseTo(22, 9);
  });

  it("makes a plausible temperate winter: colder before dawn than mid-afternoon", () => {
    let lows = 0;
    let sum = 0;
    let n = 0;
    for (let day = 0; day < 20; day++) {
      const base = Date.parse("2026-01-05T00:00:00Z") + day * 24 * HOUR;
      const dawn = weatherAt(DEFAULT_CLIMATE, 3, base + 7.5 * HOUR, "Europe/London");
      const afternoon = weatherAt(DEFAULT_CLIMATE, 3, base + 14.5 * HOUR, "Europe/London");
      if (dawn.outsideC < afternoon.outsideC) lows++;
      for (let h = 0; h < 24; h++) {
        const w = weatherAt(DEFAULT_CLIMATE, 3, base + h * HOUR, "Europe/London");
        expect(w.outsideRh).toBeGreaterThan(30);
        expect(w.outsideRh).toBeLessThanOrEqual(100);
        sum += w.outsideC;
        n++;
      }
    }
    expect(lows).toBe(20);
    expect(sum / n).toBeGreaterThan(1);
    expect(sum / n).toBeLessThan(9);
    expect(seasonalMeanC(51.5, 20)).toBeLessThan(seasonalMeanC(51.5, 200));
    expect(seasonalMeanC(-40, 20)).toBeGreaterThan(seasonalMeanC(-40, 200));
  });

  it("is a pure function of seed and time", () => {
    const t = Date.parse("2026-01-10T09:13:00Z");
    expect(weatherAt(DEFAULT_CLIMATE, 5, t, "Europe/London")).toEqual(weatherAt(DEFAULT_CLIMATE, 5, t, "Europe/London"));
    expect(weatherAt({ ...DEFAULT_CLIMATE, meanC: 12 }, 5, t, "Europe/London").outsideC).toBeGreaterThan(
      weatherAt({ ...DEFAULT_CLIMATE, meanC: 2 }, 5, t, "Europe/London").outsideC,
    );
  });
});

describe("seeded randomness", () => {
  it("repeats for a seed and stays in range", () => {
    const a = sequence(42);
    const b = sequence(42);
    for (let i = 0; i < 100; i++) {
      const x = a();
      expect(x).toBe(b());
      expect(x).toBeGreaterThanOrEqual(0);
      expect(x).toBeLessThan(1);
    }
    expect(unit(1, 2)).toBe(unit(1, 2));
    expect(unit(1, 2)).not.toBe(unit(2, 2));
    for (let t = 0; t < 10 * HOUR; t += 0.37 * HOUR) expect(Math.abs(smoothNoise(9, t, HOUR))).toBeLessThanOrEqual(1);
  });
});
