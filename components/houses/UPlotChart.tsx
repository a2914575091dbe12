"use client";

// Our own small wrapper around uPlot, loaded only in the browser (HouseChart imports it
// with next/dynamic), so the chart code never holds up the first paint.
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import type { ChartRange } from "@/lib/house-chart";
import { CHART_COLOURS, CHART_HEIGHT, type ChartPicture } from "./chart-picture";

const HEIGHT = CHART_HEIGHT;

function timeLabels(range: ChartRange, timeZone: string) {
  const format =
    range === "24h"
      ? new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone })
      : new Intl.DateTimeFormat("en-GB", { weekday: "short", day: "numeric", timeZone });
  return (_u: uPlot, splits: number[]) => splits.map((s) => format.format(new Date(s * 1000)));
}

/** Heating periods as shaded columns, then the band as a shaded strip with its edges: both behind the lines. */
function drawBackground(picture: ChartPicture) {
  return (u: uPlot) => {
    const { ctx } = u;
    const { left, top, width, height } = u.bbox;
    const x = (ms: number) => Math.min(left + width, Math.max(left, u.valToPos(ms / 1000, "x", true)));
    const y = (v: number) => Math.min(top + height, Math.max(top, u.valToPos(v, "temp", true)));
    ctx.save();
    ctx.fillStyle = CHART_COLOURS.heating;
    for (const p of picture.heating) {
      const x0 = x(p.from);
      const x1 = x(p.until);
      if (x1 > x0) ctx.fillRect(x0, top, Math.max(1, x1 - x0), height);
    }
    ctx.lineWidth = Math.max(1, devicePixelRatio);
    ctx.setLineDash([4 * devicePixelRatio, 3 * devicePixelRatio]);
    for (const b of picture.bands) {
      const x0 = x(b.from);
      const x1 = x(b.until);
      if (x1 <= x0) continue;
      if (b.low !== null && b.high !== null) {
        ctx.fillStyle = CHART_COLOURS.band;
        ctx.fillRect(x0, y(b.high), x1 - x0, y(b.low) - y(b.high));
      }
      ctx.strokeStyle = CHART_COLOURS.bandEdge;
      for (const edge of [b.low, b.high]) {
        if (edge === null) continue;
        ctx.beginPath();
        ctx.moveTo(x0, y(edge));
        ctx.lineTo(x1, y(edge));
        ctx.stroke();
      }
    }
    ctx.restore();
  };
}

function options(picture: ChartPicture, width: number): uPlot.Options {
  const edges = picture.bands.flatMap((b) => [b.low, b.high]).filter((v): v is number => v !== null);
  return {
    width,
    height: HEIGHT,
    tzDate: (ts) => uPlot.tzDate(new Date(ts * 1000), picture.timeZone),
    legend: { show: false },
    cursor: { drag: { x: false, y: false }, points: { size: 8 } },
    scales: {
      x: { time: true },
      temp: {
        range: (_u, min, max) => {
          const lo = Math.min(min ?? 0, ...edges);
          const hi = Math.max(max ?? 10, ...edges);
          return [Math.floor(lo - 1), Math.ceil(hi + 1)];
        },
      },
      rh: { range: [0, 100] },
    },
    series: [
      {},
      { label: `Temperature (${picture.unitSymbol})`, scale: "temp", stroke: CHART_COLOURS.temp, width: 2, spanGaps: false },
      { label: "Humidity (%)", scale: "rh", stroke: CHART_COLOURS.rh, width: 1.5, dash: [6, 4], spanGaps: false },
    ],
    axes: [
      { values: timeLabels(picture.range, picture.timeZone), space: 56, stroke: "#495461", grid: { stroke: "#eceff2" }, ticks: { stroke: "#d7dde3" } },
      { scale: "temp", values: (_u, splits) => splits.map((v) => `${v}°`), size: 40, stroke: "#34562c", grid: { stroke: "#eceff2" }, ticks: { stroke: "#d7dde3" } },
      { scale: "rh", side: 1, values: (_u, splits) => splits.map((v) => `${v}%`), size: 42, stroke: "#596777", grid: { show: false }, ticks: { stroke: "#d7dde3" } },
    ],
    hooks: { drawClear: [drawBackground(picture)] },
  };
}

/** A temperature and humidity chart that fills its container's width. */
export default function UPlotChart({ picture }: { picture: ChartPicture }) {
  const box = useRef<HTMLDivElement>(null);

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const data: uPlot.AlignedData = [picture.times.map((t) => t / 1000), picture.temp, picture.rh];
    const chart = new uPlot(options(picture, Math.max(200, el.clientWidth)), data, el);
    const resize = new ResizeObserver(() => chart.setSize({ width: Math.max(200, el.clientWidth), height: HEIGHT }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      chart.destroy();
    };
  }, [picture]);

  return <div ref={box} aria-hidden="true" className="w-full" style={{ minHeight: HEIGHT }} />;
}
