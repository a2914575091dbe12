import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/Card";
import { buttonClasses } from "@/components/ui/Button";
import { getUserSettings } from "@/db/queries/people";
import { getSchedulesBySite } from "@/db/queries/schedules";
import { APPLIANCE_KIND_LABELS } from "@/lib/domain";
import { groupBy } from "@/lib/group-by";
import { can } from "@/lib/permissions";
import { summarizePlan } from "@/lib/schedules/format";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Schedules — ${site.name}` };
}

export default async function SchedulesPage({ params }: Props) {
  const { user, site } = await getCurrentSite((await params).slug);
  const [rows, settings] = await Promise.all([getSchedulesBySite({ siteId: site.id }), getUserSettings({ userId: user.id })]);
  const canEdit = can(site.role, "schedules.manage");
  const byHouse = [...groupBy(rows, (r) => r.plug.houseId).values()];

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-frost-950">Schedules</h1>
        <p className="mt-1 text-sm text-frost-600">Each plug’s week of time windows. Times are {site.timeZone}.</p>
      </div>
      {byHouse.length === 0 ? <p className="text-frost-700">No plugs yet: add a house and its plugs first.</p> : null}
      {byHouse.map((plugs) => (
        <section key={plugs[0]!.plug.houseId} aria-labelledby={`house-${plugs[0]!.plug.houseId}`} className="flex flex-col gap-3">
          <h2 id={`house-${plugs[0]!.plug.houseId}`} className="text-lg font-semibold text-frost-950">
            {plugs[0]!.plug.houseName}
          </h2>
          <ul className="flex flex-col gap-3">
            {plugs.map(({ plug, plan }) => (
              <Card as="li" key={plug.id} className="flex flex-wrap items-center gap-3 p-4">
                <div className="min-w-0 flex-1">
                  <p className="font-semibold text-frost-950">
                    {plug.name} <span className="text-sm font-normal text-frost-600">· {APPLIANCE_KIND_LABELS[plug.applianceKind]}</span>
                  </p>
                  <p className="text-sm text-frost-700">{summarizePlan(plan, settings.temperatureUnit)}</p>
                </div>
                <Link href={`/sites/${site.slug}/plugs/${plug.id}/schedule`} className={buttonClasses("secondary")}>
                  {canEdit ? "Edit schedule" : "View schedule"}
                  <span className="sr-only"> of {plug.name}</span>
                </Link>
              </Card>
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}
