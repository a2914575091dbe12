"use client";

import { useRouter } from "next/navigation";
import { useId } from "react";

type SiteChoice = { slug: string; name: string };

/** Moves between the sites a person belongs to; shown only when there is more than one. */
export function SiteSwitcher({ sites, current }: { sites: SiteChoice[]; current: string }) {
  const router = useRouter();
  const id = useId();
  return (
    <div className="flex min-w-0 items-center gap-2">
      <label htmlFor={id} className="sr-only">
        Site
      </label>
      <select
        id={id}
        value={current}
        onChange={(event) => router.push(`/sites/${event.target.value}`)}
        className="min-h-10 max-w-full min-w-0 truncate rounded-lg border border-frost-300 bg-white py-1 pr-8 pl-2.5 text-sm font-medium text-frost-900 focus:border-leaf-600 focus:outline-none focus:ring-2 focus:ring-leaf-600/25"
      >
        {sites.map((site) => (
          <option key={site.slug} value={site.slug}>
            {site.name}
          </option>
        ))}
      </select>
    </div>
  );
}
