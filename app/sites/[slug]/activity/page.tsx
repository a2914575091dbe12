import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { ActivityFeed } from "@/components/activity/ActivityFeed";
import { getAuditFilterChoices } from "@/db/queries/audit-trail";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Activity — ${site.name}` };
}

export default async function ActivityPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "audit.view")) notFound();
  const choices = await getAuditFilterChoices({ siteId: site.id });

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-frost-950">Activity</h1>
        <p className="mt-1 text-sm text-frost-600">
          Every change to {site.name}: who made it, when ({site.timeZone}), and what it changed.
        </p>
      </div>
      <ActivityFeed siteId={site.id} timeZone={site.timeZone} choices={choices} />
    </div>
  );
}
