import type { Metadata } from "next";
import Link from "next/link";
import { can } from "@/lib/permissions";
import { HouseCard } from "@/components/houses/HouseCard";
import { ControllerBanner } from "@/components/houses/ControllerBanner";
import { SiteAlerts } from "@/components/houses/LiveAlerts";
import { LiveSite } from "@/components/houses/LiveSite";
import { toSiteLiveJson } from "@/components/houses/live-data";
import { NoHouses } from "@/components/houses/NoHouses";
import { HeaterSafetyNote } from "@/components/safety/HeaterSafetyNote";
import { getHouseOverviewsBySite } from "@/db/queries/houses";
import { getSiteLive } from "@/db/queries/live";
import { getCurrentSite } from "./current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Houses — ${site.name}` };
}

export default async function HousesPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const [houses, live] = await Promise.all([getHouseOverviewsBySite({ siteId: site.id }), getSiteLive({ siteId: site.id })]);
  const names = {
    houses: houses.map(({ id, name }) => ({ id, name })),
    plugs: houses.flatMap((house) => house.plugs.map(({ id, name }) => ({ id, name }))),
  };

  return (
    <LiveSite siteId={site.id} timeZone={site.timeZone} initial={toSiteLiveJson(live)}>
      <div className="flex flex-col gap-6">
        <div>
          <div className="flex flex-wrap items-end justify-between gap-3">
            <div>
              <h1 className="text-2xl font-semibold text-frost-950">Houses</h1>
              <p className="mt-1 text-sm text-frost-600">
                {houses.length === 0 ? site.name : `${houses.length} ${houses.length === 1 ? "house" : "houses"} in ${site.name}`}
              </p>
            </div>
            {houses.length > 0 && can(site.role, "houses.manage") ? (
              <Link
                href={`/sites/${site.slug}/houses/new`}
                className="inline-flex min-h-11 items-center rounded-lg border border-frost-300 bg-white px-4 text-sm font-semibold text-frost-900 hover:bg-frost-100"
              >
                Add a house
              </Link>
            ) : null}
          </div>
          <ControllerBanner />
          <SiteAlerts names={names} alertsHref={`/sites/${site.slug}/alerts`} />
        </div>

        {houses.length === 0 ? (
          <NoHouses slug={site.slug} siteName={site.name} role={site.role} />
        ) : (
          <div className="grid gap-4 md:grid-cols-2">
            {houses.map((house) => (
              <HouseCard
                key={house.id}
                house={house}
                slug={site.slug}
                role={site.role}
                timeZone={site.timeZone}
                mainsVoltage={site.mainsVoltage}
                continuousLoadPercent={site.continuousLoadPercent}
              />
            ))}
          </div>
        )}

        <HeaterSafetyNote />
      </div>
    </LiveSite>
  );
}
