import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AlertPages } from "@/components/alerts/AlertPages";
import { AlertPreferencesForm } from "@/components/alerts/AlertPreferencesForm";
import { Card } from "@/components/ui/Card";
import { getMemberAlertPreferences } from "@/db/queries/alert-preferences";
import { getSummaryTime } from "@/db/queries/summary-time";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `My alert e-mails — ${site.name}` };
}

export default async function MyAlertEmailsPage({ params }: Props) {
  const { user, site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "alerts.view")) notFound();
  const [member, summaryTime] = await Promise.all([getMemberAlertPreferences({ siteId: site.id, userId: user.id }), getSummaryTime({ siteId: site.id })]);
  if (!member) notFound();

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-frost-950">My alert e-mails</h1>
          <p className="mt-1 text-sm text-frost-600">
            What {site.name} e-mails you about, sent to {member.email}. Yours alone: the others choose their own.
          </p>
        </div>
        <AlertPages slug={site.slug} current="/mine" />
      </div>
      <Card as="section" className="p-4 sm:p-5" aria-label="My alert e-mails">
        <AlertPreferencesForm siteId={site.id} timeZone={site.timeZone} preferences={member.preferences} chosen={member.chosen} summaryTime={summaryTime} />
      </Card>
    </div>
  );
}
