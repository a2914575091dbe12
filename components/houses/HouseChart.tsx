"use client";

import dynamic from "next/dynamic";
import { useContext, useMemo, useState } from "react";
import useSWR from "swr";
import type { HouseChart as HouseChartData } from "@/db/queries/house-chart";
import { CHART_RANGE_KEYS, CHART_RANGES, type ChartRange } from "@/lib/house-chart";
import { toUnit, unitSymbol } from "@/lib/units";
import type { TemperatureUnit } from "@/lib/domain";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { CHART_COLOURS, CHART_HEIGHT, chartSummary, type ChartPicture } from "./chart-picture";
import { LiveSiteContext } from "./use-site-live";

// uPlot and its stylesheet load after the page has painted, in their own chunk.
const UPlotChart = dynamic(() => import("./UPlotChart"), {
  ssr: false,
  loading: () => <ChartSpace>Drawing the chart…</ChartSpace>,
});

function ChartSpace({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex items-center justify-center rounded-lg bg-frost-50 text-sm text-frost-600" style={{ height: CHART_HEIGHT }}>
      {children}
    </div>
  );
}

export const chartUrl = (siteId: string, houseId: string, range: ChartRange) =>
  `/api/sites/${encodeURIComponent(siteId)}/houses/${encodeURIComponent(houseId)}/chart?range=${range}`;

async function fetchChart(url: string): Promise<HouseChartData> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  const body: unknown = await response.json().catch(() => null);
  if (!response.ok) {
    const message = (body as { error?: { message?: string } } | null)?.error?.message;
    throw new Error(message ?? `The server answered with status ${response.status}.`);
  }
  return body as HouseChartData;
}

/** Temperature and humidity in the person's unit, the band's edges too, and the heaters' on-periods merged. */
export function toPicture(chart: HouseChartData, unit: TemperatureUnit, timeZone: string): ChartPicture {
  const inUnit = (c: number | null) => (c === null ? null : Math.round(toUnit(c, unit) * 100) / 100);
  return {
    range: chart.range,
    timeZone,
    unitSymbol: unitSymbol(unit),
    times: chart.times,
    temp: chart.series.tempC.map(inUnit),
    rh: chart.series.rh,
    bands: chart.bands.map((b) => ({ from: b.from, until: b.until, low: inUnit(b.lowC), high: inUnit(b.highC) })),
    heating: chart.heaters.flatMap((h) => h.periods),
  };
}

function Swatch({ style, className = "" }: { style: React.CSSProperties; className?: string }) {
  return <span aria-hidden="true" className={`inline-block h-3 w-5 shrink-0 rounded-sm ${className}`} style={style} />;
}

type HouseChartProps = { houseId: string; houseName: string; hasSensor: boolean };

/** A house's temperature and humidity over 24 hours or 7 days, with the band in force and heating periods. */
export function HouseChart({ houseId, houseName, hasSensor }: HouseChartProps) {
  const site = useContext(LiveSiteContext);
  const unit = useTemperatureUnit();
  const [range, setRange] = useState<ChartRange>("24h");
  const { data, error } = useSWR<HouseChartData, Error>(
    site && hasSensor ? chartUrl(site.siteId, houseId, range) : null,
    fetchChart,
    { refreshInterval: 60_000, keepPreviousData: true },
  );
  const timeZone = site?.timeZone ?? "UTC";
  const picture = useMemo(() => (data && data.range === range ? toPicture(data, unit, timeZone) : null), [data, range, unit, timeZone]);

  if (!hasSensor) {
    return <p className="text-sm text-frost-600">No chart: this house has no sensor to read temperature and humidity from.</p>;
  }

  return (
    <section aria-label={`Temperature and humidity chart of ${houseName}`} className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-xs font-semibold uppercase tracking-wide text-frost-600">
          Last {CHART_RANGES[range].label}
        </h3>
        <div role="group" aria-label={`Chart period for ${houseName}`} className="inline-flex rounded-lg border border-frost-300 bg-white p-0.5">
          {CHART_RANGE_KEYS.map((key) => (
            <button
              key={key}
              type="button"
              aria-pressed={range === key}
              onClick={() => setRange(key)}
              className={`min-h-11 min-w-16 rounded-md px-3 text-sm font-semibold ${
                range === key ? "bg-leaf-700 text-white" : "text-frost-800 hover:bg-frost-100"
              }`}
            >
              {CHART_RANGES[key].label}
            </button>
          ))}
        </div>
      </div>

      {error && !data ? (
        <ChartSpace>The chart could not be loaded: {error.message}</ChartSpace>
      ) : !picture ? (
        <ChartSpace>Loading the chart…</ChartSpace>
      ) : picture.temp.every((v) => v === null) && picture.rh.every((v) => v === null) ? (
        <ChartSpace>No readings in the last {CHART_RANGES[range].label}.</ChartSpace>
      ) : (
        <UPlotChart picture={picture} />
      )}

      {data && data.range === range ? (
        <>
          <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-frost-700" aria-label="Chart legend">
            <li className="flex items-center gap-1.5">
              <Swatch style={{ borderTop: `2px solid ${CHART_COLOURS.temp}`, height: 0 }} />
              Temperature ({unitSymbol(unit)}, left)
            </li>
            <li className="flex items-center gap-1.5">
              <Swatch style={{ borderTop: `2px dashed ${CHART_COLOURS.rh}`, height: 0 }} />
              Humidity (%, right)
            </li>
            {data.bands.length > 0 ? (
              <li className="flex items-center gap-1.5">
                <Swatch style={{ background: CHART_COLOURS.band, border: `1px dashed ${CHART_COLOURS.bandEdge}` }} />
                Band of {data.bandPlug?.name ?? "the heater"} (schedule as it stands now)
              </li>
            ) : null}
            {data.heaters.length > 0 ? (
              <li className="flex items-center gap-1.5">
                <Swatch style={{ background: CHART_COLOURS.heating }} />
                Heating on
              </li>
            ) : null}
          </ul>
          <p className="text-xs text-frost-700">{chartSummary(data, unit)}</p>
        </>
      ) : null}
    </section>
  );
}
