"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** The sections of a site. Sections arrive here as they are built. */
export function SiteNav({ slug }: { slug: string }) {
  const pathname = usePathname();
  const links = [{ href: `/sites/${slug}`, label: "Houses" }];
  return (
    <nav aria-label="Site sections" className="mx-auto max-w-5xl px-4">
      <ul className="-mb-px flex gap-1 overflow-x-auto">
        {links.map((link) => {
          const active = pathname === link.href;
          return (
            <li key={link.href}>
              <Link
                href={link.href}
                aria-current={active ? "page" : undefined}
                className={`inline-flex min-h-11 items-center border-b-2 px-3 text-sm font-medium ${
                  active ? "border-leaf-600 text-leaf-800" : "border-transparent text-frost-600 hover:text-frost-900"
                }`}
              >
                {link.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
