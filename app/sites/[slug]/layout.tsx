import type { ReactNode } from "react";
import { SiteHeader } from "@/components/site/SiteHeader";
import { TemperatureUnitProvider } from "@/components/site/TemperatureUnit";
import { getUserSettings } from "@/db/queries/people";
import { getCurrentSite, getMySites } from "./current-site";

type Props = { children: ReactNode; params: Promise<{ slug: string }> };

export default async function SiteLayout({ children, params }: Props) {
  const { slug } = await params;
  const { user, site } = await getCurrentSite(slug);
  const [sites, settings] = await Promise.all([getMySites(user.id), getUserSettings({ userId: user.id })]);

  return (
    <div className="min-h-dvh">
      <SiteHeader
        site={{ slug: site.slug, name: site.name, role: site.role }}
        sites={sites.map(({ slug, name }) => ({ slug, name }))}
        userName={user.name}
      />
      <main className="mx-auto max-w-5xl px-4 py-6 sm:py-8">
        <TemperatureUnitProvider unit={settings.temperatureUnit}>{children}</TemperatureUnitProvider>
      </main>
    </div>
  );
}
