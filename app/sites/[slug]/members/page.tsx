import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { MembersPanel } from "@/components/members/MembersPanel";
import { getMembersOfSite } from "@/db/queries/sites";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Members — ${site.name}` };
}

export default async function MembersPage({ params }: Props) {
  const { user, site } = await getCurrentSite((await params).slug);
  // A role without members.view is shown no such page, as the nav does not offer it.
  if (!can(site.role, "members.view")) notFound();
  const members = await getMembersOfSite({ siteId: site.id });

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-frost-950">Members</h1>
        <p className="mt-1 text-sm text-frost-600">Who can open {site.name}, and what each may do.</p>
      </div>
      <MembersPanel
        siteId={site.id}
        timeZone={site.timeZone}
        youId={user.id}
        canManage={can(site.role, "members.manage")}
        initialMembers={members.map((m) => ({ userId: m.userId, name: m.name, email: m.email, role: m.role, since: m.since.toISOString() }))}
      />
    </div>
  );
}
