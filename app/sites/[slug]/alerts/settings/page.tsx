import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AlertPages } from "@/components/alerts/AlertPages";
import { AlertRulesForm } from "@/components/alerts/AlertRulesForm";
import { HouseRulesPanel } from "@/components/alerts/HouseRulesPanel";
import { SummaryTimeForm } from "@/components/alerts/SummaryTimeForm";
import { Section } from "@/components/setup/Section";
import { getAlertRulesBySite } from "@/db/queries/alert-rules";
import { getSummaryTime } from "@/db/queries/summary-time";
import { summaryCovers } from "@/lib/alerts/summary-covers";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../../current-site";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { site } = await getCurrentSite((await params).slug);
  return { title: `Alert rules — ${site.name}` };
}

export default async function AlertRulesPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  if (!can(site.role, "alerts.view")) notFound();
  const [houses, summaryTime] = await Promise.all([getAlertRulesBySite({ siteId: site.id }), getSummaryTime({ siteId: site.id })]);
  const canEdit = can(site.role, "alerts.manage");

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-col gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-frost-950">Alert rules</h1>
          <p className="mt-1 text-sm text-frost-600">
            What counts as wrong in each house, how long it must last before anyone is told, and how far it must come back before it is back to normal.
          </p>
        </div>
        <AlertPages slug={site.slug} current="/settings" />
      </div>

      {houses.length === 0 ? <p className="text-sm text-frost-700">This site has no houses yet. Each house gets its rules once it is added.</p> : null}
      {houses.map((house) => (
        <HouseRulesPanel key={house.houseId} houseId={house.houseId} name={house.name} saved={house.saved} open={houses.length === 1}>
          <AlertRulesForm siteId={site.id} house={house} canEdit={canEdit} />
        </HouseRulesPanel>
      ))}

      <Section title="Daily summary">
        <p className="text-sm text-frost-600">
          One e-mail a day for each member who asks for it (on their “My e-mails” page): each house’s lowest and highest temperature, runtime, kWh, cost and
          alerts.
        </p>
        {can(site.role, "site.edit") ? (
          <SummaryTimeForm siteId={site.id} timeZone={site.timeZone} summaryTime={summaryTime} />
        ) : (
          <p className="text-sm text-frost-900">
            {summaryTime ? `Sent at ${summaryTime} (${site.timeZone.replaceAll("_", " ")}), covering ${summaryCovers(summaryTime)}.` : "No daily summary goes out."}{" "}
            <span className="text-frost-600">The owner sets the time.</span>
          </p>
        )}
      </Section>
    </div>
  );
}
