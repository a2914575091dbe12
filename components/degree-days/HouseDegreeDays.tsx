"use client";

import type { DegreeDayHouse } from "@/db/queries/degree-days";
import { describeTrend } from "@/lib/energy/degree-day-trend";
import { differenceToUnit, formatTemperature, unitSymbol } from "@/lib/units";
import { Card } from "@/components/ui/Card";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { DegreeDayChart } from "./DegreeDayChart";
import { degreeDayPicture } from "./picture";

const one = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const two = new Intl.NumberFormat("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
const shortDay = new Intl.DateTimeFormat("en-GB", { weekday: "short", day: "numeric", month: "short", timeZone: "UTC" });
const dayMonth = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone: "UTC" });
const asDate = (day: string) => new Date(`${day}T00:00:00Z`);
const orDash = (v: number | null, f: Intl.NumberFormat = one) => (v === null ? "—" : f.format(v));

const cell = "px-2 py-2 text-right tabular-nums";
const head = "px-2 py-2 text-right font-medium text-frost-600";

/** One house: the sentence, the heat-loss check, the charts and the tables. */
export function HouseDegreeDays({ house, unit: ddUnit }: { house: DegreeDayHouse; unit: string }) {
  const unit = useTemperatureUnit();
  const headingId = `dd-${house.id}`;
  const kelvin = unit === "f" ? "°F·day" : "K·day";
  // A kWh per kelvin-day is 1/1.8 kWh per °F-day of difference.
  const perDifference = (v: number | null) => (v === null ? null : v / differenceToUnit(1, unit));

  return (
    <Card as="article" className="flex flex-col gap-4 p-4 sm:p-5" aria-labelledby={headingId}>
      <h2 id={headingId} className="text-lg font-semibold text-frost-950">
        {house.name}
      </h2>

      {house.heaters === 0 ? (
        <p className="text-sm text-frost-700">No heater in this house, so there is no heating to set against the cold.</p>
      ) : (
        <>
          <p className="text-base text-frost-900">{describeTrend(house.trend)}</p>
          <HeatLossCheck house={house} kelvin={kelvin} perDifference={perDifference} />
          <DegreeDayChart houseName={house.name} picture={degreeDayPicture(house, ddUnit)} />
        </>
      )}

      <p className="text-xs text-frost-600">
        {house.outsideSensor
          ? `Outside temperature from “${house.outsideSensor.name}”${house.outsideSensor.onThisHouse ? ", mounted on this house" : ", the site’s outside sensor"}.`
          : "No outside sensor."}{" "}
        {house.insideSensors === 0 ? "No inside sensor, so no inside–outside figures." : null}
      </p>

      {house.heaters > 0 ? (
        <div className="overflow-x-auto">
          <table className="w-full min-w-[20rem] border-collapse text-sm">
            <caption className="mb-1 text-left text-xs font-semibold uppercase tracking-wide text-frost-600">Each week with readings (from Monday)</caption>
            <thead className="border-b border-frost-200">
              <tr>
                <th scope="col" className="px-2 py-2 text-left font-medium text-frost-600">Week of</th>
                <th scope="col" className={head}>Days</th>
                <th scope="col" className={head}>kWh</th>
                <th scope="col" className={head}>{ddUnit}</th>
                <th scope="col" className={head}>kWh per {ddUnit}</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-frost-100">
              {house.weeks.filter((w) => w.days > 0).map((w) => (
                <tr key={w.key}>
                  <th scope="row" className="px-2 py-2 text-left font-normal text-frost-900">{dayMonth.format(asDate(w.key))}</th>
                  <td className={cell}>{w.days}</td>
                  <td className={cell}>{w.days ? one.format(w.kwh) : "—"}</td>
                  <td className={cell}>{w.days ? one.format(w.degreeDays) : "—"}</td>
                  <td className={`${cell} font-semibold text-frost-950`}>{orDash(w.kwhPerDegreeDay, two)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}

      <details className="group">
        <summary className="inline-flex min-h-11 cursor-pointer items-center text-sm font-semibold text-leaf-800 underline decoration-leaf-300 underline-offset-4">
          Each day’s figures<span className="sr-only">: {house.name}</span>
        </summary>
        <div className="mt-2 overflow-x-auto">
          <table className="w-full min-w-[36rem] border-collapse text-sm">
            <thead className="border-b border-frost-200">
              <tr>
                <th scope="col" className="px-2 py-2 text-left font-medium text-frost-600">Day</th>
                <th scope="col" className={head}>Outside low–high</th>
                <th scope="col" className={head}>Outside mean</th>
                <th scope="col" className={head}>Inside mean</th>
                <th scope="col" className={head}>{ddUnit}</th>
                <th scope="col" className={head}>Inside–outside ({kelvin})</th>
                <th scope="col" className={head}>kWh</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-frost-100">
              {[...house.days].reverse().map((d) => (
                <tr key={d.day}>
                  <th scope="row" className="whitespace-nowrap px-2 py-2 text-left font-normal text-frost-900">{shortDay.format(asDate(d.day))}</th>
                  <td className={`${cell} whitespace-nowrap`}>
                    {d.outside ? `${formatTemperature(d.outside.minC, unit).replace(` ${unitSymbol(unit)}`, "")} – ${formatTemperature(d.outside.maxC, unit)}` : "missing"}
                  </td>
                  <td className={`${cell} whitespace-nowrap`}>{d.outside ? formatTemperature(d.outside.meanC, unit) : "missing"}</td>
                  <td className={`${cell} whitespace-nowrap`}>{d.insideMeanC === null ? "missing" : formatTemperature(d.insideMeanC, unit)}</td>
                  <td className={cell}>{orDash(d.degreeDays)}</td>
                  <td className={cell}>{d.insideOutside === null ? "—" : one.format(differenceToUnit(d.insideOutside, unit))}</td>
                  <td className={cell}>{orDash(d.heatingKwh)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="mt-2 text-xs text-frost-600">“missing”: the sensor read less than three quarters of that day, so the day is left out rather than counted as 0.</p>
        </div>
      </details>
    </Card>
  );
}

function HeatLossCheck({ house, kelvin, perDifference }: { house: DegreeDayHouse; kelvin: string; perDifference: (v: number | null) => number | null }) {
  const measured = perDifference(house.kwhPerKelvinDay);
  const expected = perDifference(house.expectedKwhPerKelvinDay);
  if (measured === null) return null;
  const share = expected ? measured / expected : null;
  return (
    <div className="rounded-lg bg-frost-50 px-3 py-3 text-sm text-frost-800 ring-1 ring-frost-200">
      <p>
        Against its own inside–outside difference it took <span className="font-semibold text-frost-950">{two.format(measured)} kWh per {kelvin}</span>
        {expected !== null ? (
          <>
            ; its glazing and size suggest about <span className="font-semibold text-frost-950">{two.format(expected)}</span> with no sun
          </>
        ) : null}
        .
      </p>
      {share !== null ? (
        <p className="mt-1 text-xs text-frost-600">
          {share > 1.15
            ? "More than the sums expect: look for draughts, gaps, an open vent or door, or a tired cover."
            : "Sun and the warmth stored in the ground usually bring it under the sums’ figure."}
        </p>
      ) : null}
    </div>
  );
}
