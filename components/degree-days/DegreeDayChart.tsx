"use client";

import dynamic from "next/dynamic";
import { DEGREE_DAY_CHART_HEIGHT, DEGREE_DAY_COLOURS, type DegreeDayPicture } from "./picture";

// uPlot loads after the page has painted, in its own chunk.
const DegreeDayPlots = dynamic(() => import("./DegreeDayPlots"), {
  ssr: false,
  loading: () => (
    <div className="flex items-center justify-center rounded-lg bg-frost-50 text-sm text-frost-600" style={{ height: DEGREE_DAY_CHART_HEIGHT }}>
      Drawing the charts…
    </div>
  ),
});

function Dot({ colour }: { colour: string }) {
  return <span aria-hidden="true" className="inline-block size-2.5 shrink-0 rounded-full" style={{ background: colour }} />;
}

/** A house's daily kWh against degree-days, and its weekly kWh per degree-day over time. */
export function DegreeDayChart({ houseName, picture }: { houseName: string; picture: DegreeDayPicture }) {
  if (picture.points.length < 2) return null;
  return (
    <figure className="flex flex-col gap-2" aria-label={`Charts of heating against the cold for ${houseName}; the numbers are in the tables below`}>
      <DegreeDayPlots picture={picture} />
      <figcaption>
        <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-frost-700">
          <li className="flex items-center gap-1.5">
            <Dot colour={DEGREE_DAY_COLOURS.before} />
            {picture.step ? "A day before the change" : "A day"}
          </li>
          {picture.step ? (
            <li className="flex items-center gap-1.5">
              <Dot colour={DEGREE_DAY_COLOURS.after} />A day since the change
            </li>
          ) : null}
          <li className="flex items-center gap-1.5">
            <span aria-hidden="true" className="inline-block w-5 border-t-2 border-dashed" style={{ borderColor: DEGREE_DAY_COLOURS.level }} />
            {picture.step ? "Level before and after" : "Weekly figure"}
          </li>
        </ul>
      </figcaption>
    </figure>
  );
}
