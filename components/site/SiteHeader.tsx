import Link from "next/link";
import { SignOutButton } from "@/components/auth/SignOutButton";
import { Wordmark } from "@/components/brand/Wordmark";
import { ROLE_LABELS, type Role } from "@/lib/permissions";
import { SiteNav } from "./SiteNav";
import { SiteSwitcher } from "./SiteSwitcher";

type SiteHeaderProps = {
  site: { slug: string; name: string; role: Role };
  sites: { slug: string; name: string }[];
  userName: string;
};

export function SiteHeader({ site, sites, userName }: SiteHeaderProps) {
  return (
    <header className="border-b border-frost-200 bg-white">
      <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-x-4 gap-y-2 px-4 pt-2">
        <Link href={`/sites/${site.slug}`} className="shrink-0" aria-label={`Cloche — ${site.name}`}>
          <Wordmark />
        </Link>
        <div className="order-last min-w-0 basis-full sm:order-none sm:basis-auto">
          {sites.length > 1 ? (
            <SiteSwitcher sites={sites} current={site.slug} />
          ) : (
            <p className="truncate text-sm font-medium text-frost-800">{site.name}</p>
          )}
        </div>
        <div className="ml-auto flex min-w-0 items-center gap-2">
          <p className="min-w-0 text-right text-sm leading-tight">
            <span className="block truncate font-medium text-frost-900">{userName}</span>
            <span className="block text-xs text-frost-600">{ROLE_LABELS[site.role].name}</span>
          </p>
          <SignOutButton className="shrink-0" />
        </div>
      </div>
      <SiteNav slug={site.slug} role={site.role} />
    </header>
  );
}
