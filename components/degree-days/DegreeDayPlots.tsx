"use client";

// Two small uPlot charts, loaded only in the browser (DegreeDayChart imports this with next/dynamic).
import { useEffect, useRef } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { DEGREE_DAY_CHART_HEIGHT as HEIGHT, DEGREE_DAY_COLOURS as COLOURS, type DegreeDayPicture } from "./picture";

const axis = { stroke: "#495461", grid: { stroke: "#eceff2" }, ticks: { stroke: "#d7dde3" } };
const dots = (colour: string): uPlot.Series => ({ stroke: colour, fill: colour, paths: () => null, points: { show: true, size: 7, stroke: colour, fill: colour } });
const round = (v: number) => Math.round(v * 10) / 10;

/** Daily kWh (up) against degree-days (across): a house that loses less heat sits on a flatter line. */
function scatter(picture: DegreeDayPicture, width: number): [uPlot.Options, uPlot.AlignedData] {
  const sorted = [...picture.points].sort((a, b) => a.degreeDays - b.degreeDays);
  const data: uPlot.AlignedData = [
    sorted.map((p) => p.degreeDays),
    sorted.map((p) => (p.after ? null : p.kwh)),
    sorted.map((p) => (p.after ? p.kwh : null)),
  ];
  return [
    {
      width,
      height: HEIGHT,
      legend: { show: false },
      cursor: { show: false },
      scales: { x: { time: false, range: (_u, _min, max) => [0, Math.ceil((max ?? 1) + 0.5)] }, y: { range: (_u, _min, max) => [0, Math.ceil((max ?? 1) * 1.1)] } },
      series: [{}, dots(COLOURS.before), dots(COLOURS.after)],
      axes: [
        { ...axis, label: `Degree-days (${picture.unit})`, labelSize: 20, values: (_u, s) => s.map((v) => `${round(v)}`) },
        { ...axis, label: "kWh", labelSize: 20, size: 40, values: (_u, s) => s.map((v) => `${round(v)}`) },
      ],
    },
    data,
  ];
}

/** Weekly kWh per degree-day over time, with the levels before and after the change. */
function weekly(picture: DegreeDayPicture, width: number): [uPlot.Options, uPlot.AlignedData] {
  const times = picture.weeks.map((w) => w.atMs / 1000);
  const level = picture.step ? picture.weeks.map((w) => (w.atMs < picture.step!.sinceMs ? picture.step!.before : picture.step!.after)) : null;
  const data: uPlot.AlignedData = [times, picture.weeks.map((w) => w.kwhPerDegreeDay), ...(level ? [level] : [])];
  const dates = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone: "UTC" });
  return [
    {
      width,
      height: HEIGHT,
      legend: { show: false },
      cursor: { show: false },
      scales: { x: { time: true }, y: { range: (_u, _min, max) => [0, Math.ceil((max ?? 1) * 1.2 * 10) / 10] } },
      series: [
        {},
        { stroke: COLOURS.after, width: 2, points: { show: true, size: 7, fill: COLOURS.after } },
        ...(level ? [{ stroke: COLOURS.level, width: 2, dash: [6, 4], points: { show: false } } satisfies uPlot.Series] : []),
      ],
      axes: [
        { ...axis, space: 60, values: (_u, s) => s.map((v) => dates.format(new Date(v * 1000))) },
        { ...axis, label: `kWh per ${picture.unit}`, labelSize: 20, size: 44, values: (_u, s) => s.map((v) => `${round(v)}`) },
      ],
    },
    data,
  ];
}

function Plot({ build, picture }: { build: typeof scatter; picture: DegreeDayPicture }) {
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const [options, data] = build(picture, Math.max(200, el.clientWidth));
    const chart = new uPlot(options, data, el);
    const resize = new ResizeObserver(() => chart.setSize({ width: Math.max(200, el.clientWidth), height: HEIGHT }));
    resize.observe(el);
    return () => {
      resize.disconnect();
      chart.destroy();
    };
  }, [build, picture]);
  return <div ref={box} aria-hidden="true" className="w-full" style={{ minHeight: HEIGHT }} />;
}

export default function DegreeDayPlots({ picture }: { picture: DegreeDayPicture }) {
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <div>
        <h4 className="mb-1 text-xs font-semibold uppercase tracking-wide text-frost-600">Each day: kWh against degree-days</h4>
        <Plot build={scatter} picture={picture} />
      </div>
      {picture.weeks.length > 0 ? (
        <div>
          <h4 className="mb-1 text-xs font-semibold uppercase tracking-wide text-frost-600">Each week: kWh per degree-day</h4>
          <Plot build={weekly} picture={picture} />
        </div>
      ) : null}
    </div>
  );
}
