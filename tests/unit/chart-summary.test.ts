import { describe, expect, it } from "vitest";
import { chartSummary } from "@/components/houses/chart-picture";
import type { HouseChart } from "@/db/queries/house-chart";

const H = 3600_000;
const chart = (over: Partial<HouseChart> = {}): HouseChart => ({
  range: "24h",
  from: 0,
  until: 24 * H,
  bucketMs: 300_000,
  sensor: { id: "s", name: "Air" },
  times: [0, 300_000, 600_000],
  series: { tempC: [4, null, 6.04], tempMinC: [-1.26, null, 5.5], tempMaxC: [4.5, null, 7], rh: [90, null, 81.4] },
  bandPlug: null,
  bands: [],
  heaters: [
    { id: "a", name: "Heater A", periods: [{ from: 0, until: 2 * H }] },
    { id: "b", name: "Heater B", periods: [{ from: H, until: 3 * H + 20 * 60_000 }] },
  ],
  ...over,
});

describe("chartSummary", () => {
  it("lowest, highest and latest temperature and humidity, and the heating time counted once", () => {
    expect(chartSummary(chart(), "c")).toBe(
      "Temperature −1.3 °C to 7.0 °C, latest 6.0 °C. Humidity 81 % to 90 %, latest 81 %. Heating on for 3 h 20 min in all.",
    );
  });

  it("in °F", () => {
    // −1.26 °C = 29.732 °F, 7 °C = 44.6 °F, 6.04 °C = 42.872 °F (F = C × 9/5 + 32).
    expect(chartSummary(chart({ heaters: [] }), "f")).toBe("Temperature 29.7 °F to 44.6 °F, latest 42.9 °F. Humidity 81 % to 90 %, latest 81 %.");
  });

  it("says so when nothing was read and the heater stayed off", () => {
    const empty = chart({ series: { tempC: [null], tempMinC: [null], tempMaxC: [null], rh: [null] }, heaters: [{ id: "a", name: "A", periods: [] }] });
    expect(chartSummary(empty, "c")).toBe("No readings in this time. Heating off throughout.");
  });
});
