import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { HouseDegreeDays } from "@/components/degree-days/HouseDegreeDays";
import { NoOutsideSensor } from "@/components/degree-days/NoOutsideSensor";
import { RangeChoice, degreeDayRange, spanOf } from "@/components/degree-days/RangeChoice";
import { PageTitle } from "@/components/setup/PageTitle";
import { getDegreeDayReport } from "@/db/queries/degree-days";
import { DEGREE_DAY_METHOD_LABELS } from "@/lib/domain";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }>; searchParams: Promise<{ range?: string | string[] }> };

export const metadata: Metadata = { title: "Degree-days" };

const longDay = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });
const asDate = (day: string) => new Date(`${day}T00:00:00Z`);

export default async function DegreeDaysPage({ params, searchParams }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "reports.view")) notFound();
  const range = degreeDayRange((await searchParams).range);

  const { fromDay, toDay } = spanOf(range, site.timeZone);
  const report = await getDegreeDayReport({ siteId: site.id, fromDay, toDay });

  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Degree-days" back={{ href: `/sites/${encodeURIComponent(site.slug)}/reports`, label: "Reports" }}>
        How much heating each house needed for the cold it met, {longDay.format(asDate(fromDay))} to {longDay.format(asDate(toDay))}. A
        lower kWh per degree-day after insulation work means the work paid off.
      </PageTitle>
      <RangeChoice slug={site.slug} current={range} />

      {report.outsideSensors.length === 0 ? (
        <NoOutsideSensor slug={site.slug} canAdd={can(site.role, "devices.manage")} />
      ) : report.houses.length === 0 ? (
        <p className="text-sm text-frost-700">This site has no houses yet.</p>
      ) : (
        <>
          {report.houses.map((house) => (
            <HouseDegreeDays key={house.id} house={house} unit={report.unit} />
          ))}
          <p className="text-xs text-frost-600">
            Degree-days: {DEGREE_DAY_METHOD_LABELS[report.method]}, in {report.unit} (an owner can change this under Settings). kWh are the
            house’s heaters’ only: metered where the plug meters, from the heater’s rating otherwise. A day counts when its sensors read at
            least three quarters of it; a week’s figure needs four such days and enough cold to mean something.
          </p>
        </>
      )}
    </div>
  );
}
