import type { Metadata } from "next";
import Link from "next/link";
import { PageTitle } from "@/components/setup/PageTitle";
import { Section } from "@/components/setup/Section";
import { SiteSettingsForm } from "@/components/setup/SiteSettingsForm";
import { UnitForm } from "@/components/setup/UnitForm";
import { DEGREE_DAY_METHOD_LABELS } from "@/lib/domain";
import { can } from "@/lib/permissions";
import { getCurrentSite } from "../current-site";

type Props = { params: Promise<{ slug: string }> };

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage({ params }: Props) {
  const { site } = await getCurrentSite((await params).slug);
  const settings = {
    name: site.name,
    timeZone: site.timeZone,
    currency: site.currency,
    mainsVoltage: site.mainsVoltage,
    continuousLoadPercent: site.continuousLoadPercent,
    degreeDayMethod: site.degreeDayMethod,
  };
  const rows: [string, string][] = [
    ["Site name", settings.name],
    ["Time zone", settings.timeZone.replaceAll("_", " ")],
    ["Currency", settings.currency],
    ["Mains voltage", `${settings.mainsVoltage} V`],
    ["Continuous-load margin", `${settings.continuousLoadPercent} % of a plug’s rating`],
    ["Degree-days", DEGREE_DAY_METHOD_LABELS[settings.degreeDayMethod]],
  ];
  return (
    <div className="flex flex-col gap-6">
      <PageTitle title="Settings" />
      <Section title="Your settings">
        <p className="text-sm text-frost-600">Yours alone, the same in every site you belong to.</p>
        <UnitForm />
        <Link href={`/sites/${site.slug}/alerts/mine`} className="inline-flex min-h-11 items-center self-start text-sm font-medium text-leaf-800 underline underline-offset-2">
          My alert e-mails for this site
        </Link>
      </Section>
      <Section title="Site settings">
        {can(site.role, "site.edit") ? (
          <SiteSettingsForm siteId={site.id} site={settings} />
        ) : (
          <>
            <dl className="grid gap-3 text-sm sm:grid-cols-2">
              {rows.map(([label, value]) => (
                <div key={label}>
                  <dt className="text-xs text-frost-600">{label}</dt>
                  <dd className="text-frost-950">{value}</dd>
                </div>
              ))}
            </dl>
            <p className="text-xs text-frost-600">Only the site’s owners change these.</p>
          </>
        )}
        <Link href={`/sites/${site.slug}/alerts/settings`} className="inline-flex min-h-11 items-center self-start text-sm font-medium text-leaf-800 underline underline-offset-2">
          Alert rules and the daily summary time
        </Link>
      </Section>
    </div>
  );
}
