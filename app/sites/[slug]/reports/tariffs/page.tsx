import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PageTitle } from "@/components/setup/PageTitle";
import { TariffsPanel } from "@/components/tariffs/TariffsPanel";
import { getTariffsBySite } from "@/db/queries/tariffs";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }> };

export const metadata: Metadata = { title: "Tariffs" };

export default async function TariffsPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "reports.view")) notFound();
  const { tariffs, currentTariffId, today } = await getTariffsBySite({ siteId: site.id, timeZone: site.timeZone });
  const canEdit = can(site.role, "tariffs.manage");
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Tariffs" back={{ href: `/sites/${site.slug}/reports`, label: "Reports" }}>
        What the site pays for electricity, day by day. Reports and bill checks cost heating with the tariff of each day.
        {canEdit ? null : " Only the site’s owners change tariffs."}
      </PageTitle>
      <TariffsPanel
        siteId={site.id}
        currency={site.currency}
        tariffs={tariffs}
        currentTariffId={currentTariffId}
        today={today}
        canEdit={canEdit}
      />
    </div>
  );
}
