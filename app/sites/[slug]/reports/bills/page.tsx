import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { BillsPanel } from "@/components/bills/BillsPanel";
import { PageTitle } from "@/components/setup/PageTitle";
import { getBillChecks, siteToday } from "@/db/queries/bills";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }> };

export const metadata: Metadata = { title: "Bill check" };

export default async function BillsPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "reports.view")) notFound();
  const bills = await getBillChecks({ siteId: site.id });
  const canEdit = can(site.role, "tariffs.manage");
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Bill check" back={{ href: `/sites/${site.slug}/reports`, label: "Reports" }}>
        Each electricity bill beside what Cloche counted for heating over the same days, and what is left for everything else.
      </PageTitle>
      <BillsPanel
        siteId={site.id}
        currency={site.currency}
        bills={bills}
        canEdit={canEdit}
        canExport={can(site.role, "reports.export")}
        today={siteToday(site.timeZone)}
        tariffsHref={`/sites/${site.slug}/reports/tariffs`}
        reportsHref={`/sites/${site.slug}/reports`}
      />
    </div>
  );
}
