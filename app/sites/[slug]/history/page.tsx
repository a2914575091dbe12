import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { SwitchHistory } from "@/components/history/SwitchHistory";
import { getSwitchHistoryChoices } from "@/db/queries/switch-history";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Switch history — ${site.name}` };
}

export default async function HistoryPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "history.view")) notFound();
  const choices = await getSwitchHistoryChoices({ siteId: site.id });

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-frost-950">Switch history</h1>
        <p className="mt-1 text-sm text-frost-600">
          Every time a plug at {site.name} was switched, newest first, with why and what the plug said. Times are in {site.timeZone}.
        </p>
      </div>
      <SwitchHistory siteId={site.id} timeZone={site.timeZone} choices={choices} canExport={can(site.role, "reports.export")} />
    </div>
  );
}
