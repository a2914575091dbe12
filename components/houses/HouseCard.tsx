import Link from "next/link";
import type { HouseOverview } from "@/db/queries/houses";
import { GLAZING_LABELS, HOUSE_KIND_LABELS, type Role } from "@/lib/domain";
import { can } from "@/lib/permissions";
import { Card } from "@/components/ui/Card";
import { formatMetres } from "./format";
import { HouseChart } from "./HouseChart";
import { HouseAlerts } from "./LiveAlerts";
import { LiveReadings } from "./LiveReadings";
import { PlugList } from "./PlugList";
import { SensorList } from "./SensorList";

type HouseCardProps = {
  house: HouseOverview;
  slug: string;
  role: Role;
  timeZone: string;
  mainsVoltage: number;
  continuousLoadPercent: number;
};

export function HouseCard({ house, slug, role, timeZone, mainsVoltage, continuousLoadPercent }: HouseCardProps) {
  const area = house.lengthM * house.widthM;
  const headingId = `house-${house.id}`;
  return (
    <Card as="article" className="flex flex-col gap-4 p-4 sm:p-5" aria-labelledby={headingId}>
      <header className="flex flex-wrap items-start justify-between gap-2">
        <h2 id={headingId} className="text-lg font-semibold text-frost-950">
          {house.name}
        </h2>
        <span className="rounded-full bg-leaf-50 px-2.5 py-0.5 text-xs font-medium text-leaf-800 ring-1 ring-leaf-200">
          {HOUSE_KIND_LABELS[house.kind]}
        </span>
      </header>

      <HouseAlerts houseId={house.id} />

      <LiveReadings
        houseName={house.name}
        sensors={house.sensors.map(({ id, name, placement, lastSeenAt, staleAfterS }) => ({ id, name, placement, lastSeenAt, staleAfterS }))}
      />

      <HouseChart houseId={house.id} houseName={house.name} hasSensor={house.sensors.some((s) => s.placement === "inside")} />

      <section aria-label={`Plugs in ${house.name}`}>
        <h3 className="mb-2 text-xs font-semibold uppercase tracking-wide text-frost-600">Plugs</h3>
        <PlugList
          plugs={house.plugs}
          slug={slug}
          role={role}
          timeZone={timeZone}
          mainsVoltage={mainsVoltage}
          continuousLoadPercent={continuousLoadPercent}
        />
      </section>

      <section aria-label={`Sensors in ${house.name}`}>
        <h3 className="mb-2 text-xs font-semibold uppercase tracking-wide text-frost-600">Sensors</h3>
        <SensorList sensors={house.sensors} timeZone={timeZone} />
      </section>

      <dl className="grid grid-cols-2 gap-x-4 gap-y-2 border-t border-frost-100 pt-3 text-sm">
        <div>
          <dt className="text-xs text-frost-600">Floor area</dt>
          <dd className="text-frost-900">
            {formatMetres(house.lengthM)} × {formatMetres(house.widthM)} m = {formatMetres(area)} m²
          </dd>
        </div>
        <div>
          <dt className="text-xs text-frost-600">Glazing</dt>
          <dd className="text-frost-900">{GLAZING_LABELS[house.glazing]}</dd>
        </div>
      </dl>
      {can(role, "houses.manage") ? (
        <Link
          href={`/sites/${encodeURIComponent(slug)}/houses/${encodeURIComponent(house.id)}`}
          className="-mt-1 inline-flex min-h-11 items-center self-start text-sm font-semibold text-leaf-800 underline decoration-leaf-300 underline-offset-4 hover:decoration-leaf-700"
        >
          House settings<span className="sr-only">: {house.name}</span>
        </Link>
      ) : null}
    </Card>
  );
}
