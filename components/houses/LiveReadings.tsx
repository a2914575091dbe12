"use client";

import { isReadingStale } from "@/lib/control/sensor";
import type { SensorPlacement, TemperatureUnit } from "@/lib/domain";
import { dewPointC, vapourPressureDeficitKPa } from "@/lib/psychrometrics";
import { toUnit, unitSymbol } from "@/lib/units";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { formatInstant } from "./format";
import type { SensorLiveJson } from "./live-data";
import { formatAgo, formatRh, formatTemp } from "./live-format";
import { ReadingsPlaceholder } from "./ReadingsPlaceholder";
import { useNow, useSiteLive } from "./use-site-live";

type LiveReadingsProps = {
  houseName: string;
  /** staleAfterS: how old a reading may be before it is shown as not recent (sensorStaleAfterS). */
  /** An outside sensor is shown under its name as the outside air, never as the house's temperature. */
  sensors: { id: string; name: string; placement: SensorPlacement; lastSeenAt: Date | null; staleAfterS: number }[];
};

/** Each sensor's latest temperature and humidity with its 24 h range, or an honest placeholder. */
export function LiveReadings({ houseName, sensors }: LiveReadingsProps) {
  const live = useSiteLive();
  const now = useNow();
  if (sensors.length === 0) return <ReadingsPlaceholder hasSensor={false} />;

  const rows = sensors.map((sensor) => ({ sensor, live: live?.data.sensors.find((s) => s.sensorId === sensor.id) }));
  if (!rows.some((row) => row.live?.latest)) {
    const heardBefore = rows.some((row) => (row.live ? row.live.lastSeenAt : row.sensor.lastSeenAt) !== null);
    return <ReadingsPlaceholder hasSensor heardBefore={heardBefore} />;
  }

  const timeZone = live?.timeZone ?? "UTC";
  return (
    <div className="flex flex-col gap-2">
      {rows.map(({ sensor, live: reading }) =>
        reading?.latest ? (
          <SensorReading
            key={sensor.id}
            label={sensor.placement === "outside" ? `${sensor.name} (outside air)` : sensors.length > 1 ? sensor.name : null}
            houseName={houseName}
            reading={reading}
            staleAfterS={sensor.staleAfterS}
            now={now}
            timeZone={timeZone}
          />
        ) : (
          <p key={sensor.id} className="rounded-lg border border-dashed border-frost-300 px-3 py-2 text-sm text-frost-700">
            <span className="font-medium">{sensor.name}</span>: no readings in the last 24 hours
          </p>
        ),
      )}
    </div>
  );
}

type SensorReadingProps = {
  label: string | null;
  houseName: string;
  reading: SensorLiveJson;
  staleAfterS: number;
  now: Date;
  timeZone: string;
};

/** A °C value in the person's unit, one decimal, true minus sign. */
const inUnit = (c: number, unit: TemperatureUnit) => formatTemp(toUnit(c, unit));

function SensorReading({ label, houseName, reading, staleAfterS, now, timeZone }: SensorReadingProps) {
  const unit = useTemperatureUnit();
  const latest = reading.latest!;
  const at = new Date(latest.at);
  const stale = isReadingStale(at.getTime(), now.getTime(), staleAfterS);
  const range = reading.last24h;
  const where = label ? `${houseName}, ${label}` : houseName;

  return (
    <section
      aria-label={`Readings in ${where}`}
      className="rounded-lg bg-frost-50 px-3 py-3 ring-1 ring-frost-200 sm:px-4"
    >
      {label ? <h4 className="mb-1 text-xs font-medium text-frost-600">{label}</h4> : null}
      <div className="flex flex-wrap items-end justify-between gap-x-4 gap-y-1">
        <p aria-live="polite" aria-atomic="true" className="flex items-baseline gap-3 tabular-nums">
          {latest.tempC !== null ? (
            <span className={`text-4xl font-semibold tracking-tight ${stale ? "text-frost-500" : "text-frost-950"}`}>
              {inUnit(latest.tempC, unit)}
              <span className="ml-0.5 text-xl font-medium text-frost-600">{unitSymbol(unit)}</span>
            </span>
          ) : (
            <span className="text-base text-frost-600">No temperature in the last reading</span>
          )}
          {latest.rh !== null ? (
            <span className="text-base text-frost-700">
              {formatRh(latest.rh)} <span className="text-sm text-frost-600">RH</span>
            </span>
          ) : null}
        </p>
        <p className={`text-xs ${stale ? "font-medium text-soil-700" : "text-frost-600"}`}>
          {stale ? (
            <span className="mr-1 inline-block rounded bg-soil-100 px-1.5 py-px text-soil-800 ring-1 ring-soil-200">
              Not recent
            </span>
          ) : null}
          as of{" "}
          <time dateTime={latest.at} title={formatInstant(at, timeZone)}>
            {formatAgo(at, now)}
          </time>
        </p>
      </div>
      <Humidity tempC={latest.tempC} rh={latest.rh} unit={unit} />
      {range && range.tempMinC !== null && range.tempMaxC !== null ? (
        <DayRange minC={range.tempMinC} maxC={range.tempMaxC} nowC={latest.tempC} rhMin={range.rhMin} rhMax={range.rhMax} unit={unit} />
      ) : null}
    </section>
  );
}

const kPa = new Intl.NumberFormat("en", { minimumFractionDigits: 2, maximumFractionDigits: 2 });

/** Dew point (how near the glass and leaves are to condensation) and vapour pressure deficit, from the latest reading. */
function Humidity({ tempC, rh, unit }: { tempC: number | null; rh: number | null; unit: TemperatureUnit }) {
  const dew = dewPointC(tempC, rh);
  const vpd = vapourPressureDeficitKPa(tempC, rh);
  if (dew === null) return null;
  return (
    <p className="mt-1 text-sm tabular-nums text-frost-700">
      Dew point <span className="font-medium text-frost-900">{inUnit(dew, unit)} {unitSymbol(unit)}</span>
      {vpd !== null ? (
        <>
          <span aria-hidden="true" className="text-frost-400"> · </span>
          <abbr title="Vapour pressure deficit" className="no-underline">
            VPD
          </abbr>{" "}
          {kPa.format(vpd)} kPa
        </>
      ) : null}
    </p>
  );
}

type DayRangeProps = {
  minC: number;
  maxC: number;
  nowC: number | null;
  rhMin: number | null;
  rhMax: number | null;
  unit: TemperatureUnit;
};

/** The last 24 h low and high, with where the latest reading sits between them. */
function DayRange({ minC, maxC, nowC, rhMin, rhMax, unit }: DayRangeProps) {
  const symbol = unitSymbol(unit);
  const span = maxC - minC;
  const position = nowC === null ? null : span > 0 ? Math.min(1, Math.max(0, (nowC - minC) / span)) : 0.5;
  return (
    <div className="mt-3">
      <p className="sr-only">
        Last 24 hours: low {inUnit(minC, unit)} {symbol}, high {inUnit(maxC, unit)} {symbol}
        {rhMin !== null && rhMax !== null ? `, humidity ${formatRh(rhMin)} to ${formatRh(rhMax)}` : ""}.
      </p>
      <div aria-hidden="true" className="flex items-center gap-2 text-xs tabular-nums text-frost-700">
        <span className="w-16 shrink-0">
          <span className="text-frost-400">↓</span> {inUnit(minC, unit)}°
        </span>
        <span className="relative h-1.5 flex-1 rounded-full bg-linear-to-r from-frost-200 to-soil-200">
          {position !== null ? (
            <span
              className="absolute top-1/2 size-3 -translate-x-1/2 -translate-y-1/2 rounded-full border-2 border-white bg-frost-800 shadow-sm"
              style={{ left: `${position * 100}%` }}
            />
          ) : null}
        </span>
        <span className="w-16 shrink-0 text-right">
          <span className="text-frost-400">↑</span> {inUnit(maxC, unit)}°
        </span>
      </div>
      <p aria-hidden="true" className="mt-1 flex justify-between text-xs text-frost-600">
        <span>last 24 h</span>
        {rhMin !== null && rhMax !== null ? (
          <span className="tabular-nums">
            RH {Math.round(rhMin)}–{formatRh(rhMax)}
          </span>
        ) : null}
      </p>
    </div>
  );
}
