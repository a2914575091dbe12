import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AlertList } from "@/components/alerts/AlertList";
import { AlertPages } from "@/components/alerts/AlertPages";
import { getHousesBySite } from "@/db/queries/houses";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Alerts — ${site.name}` };
}

export default async function AlertsPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "alerts.view")) notFound();
  const houses = await getHousesBySite({ siteId: site.id });

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-frost-950">Alerts</h1>
          <p className="mt-1 text-sm text-frost-600">What went wrong at {site.name}, who was told and who has seen it. Times are in {site.timeZone.replaceAll("_", " ")}.</p>
        </div>
        <AlertPages slug={site.slug} current="" />
      </div>
      <AlertList
        siteId={site.id}
        timeZone={site.timeZone}
        houses={houses.map(({ id, name }) => ({ id, name }))}
        canAcknowledge={can(site.role, "alerts.acknowledge")}
      />
    </div>
  );
}
