import { formatMetres } from "@/components/houses/format";
import { Temperature } from "@/components/site/TemperatureUnit";
import type { House } from "@/db/queries/houses";
import { GLAZING_LABELS, HOUSE_KIND_LABELS } from "@/lib/domain";

/** A house's settings, read only. */
export function HouseSummary({ house }: { house: House }) {
  const rows: [string, React.ReactNode][] = [
    ["Kind", HOUSE_KIND_LABELS[house.kind]],
    ["Glazing", GLAZING_LABELS[house.glazing]],
    ["Floor", `${formatMetres(house.lengthM)} × ${formatMetres(house.widthM)} m`],
    ["Eaves / ridge", `${formatMetres(house.eaveHeightM)} / ${formatMetres(house.ridgeHeightM)} m`],
    ["Air changes per hour", formatMetres(house.airChangesPerHour)],
    ["Low limit (frost)", <Temperature key="low" c={house.lowLimitC} />],
    ["High limit (cut-out)", <Temperature key="high" c={house.highLimitC} />],
  ];
  return (
    <dl className="grid gap-3 text-sm sm:grid-cols-2">
      {rows.map(([label, value]) => (
        <div key={label}>
          <dt className="text-xs text-frost-600">{label}</dt>
          <dd className="text-frost-950">{value}</dd>
        </div>
      ))}
      {house.notes ? (
        <div className="sm:col-span-2">
          <dt className="text-xs text-frost-600">Notes</dt>
          <dd className="whitespace-pre-line text-frost-950">{house.notes}</dd>
        </div>
      ) : null}
    </dl>
  );
}
