"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useRef } from "react";
import { can, type Action, type Role } from "@/lib/permissions";

/** The sections of a site, each shown to the roles that may open it. */
const SECTIONS: { path: string; label: string; action: Action }[] = [
  { path: "", label: "Houses", action: "site.view" },
  { path: "/schedules", label: "Schedules", action: "site.view" },
  { path: "/devices", label: "Devices", action: "site.view" },
  { path: "/alerts", label: "Alerts", action: "alerts.view" },
  { path: "/history", label: "History", action: "history.view" },
  { path: "/reports", label: "Reports", action: "reports.view" },
  { path: "/members", label: "Members", action: "members.view" },
  { path: "/activity", label: "Activity", action: "audit.view" },
  { path: "/settings", label: "Settings", action: "site.view" },
];

export function SiteNav({ slug, role }: { slug: string; role: Role }) {
  const pathname = usePathname();
  const list = useRef<HTMLUListElement>(null);
  // On a phone the sections scroll sideways: keep the one open in sight.
  useEffect(() => {
    list.current?.querySelector('[aria-current="page"]')?.scrollIntoView?.({ block: "nearest", inline: "nearest" });
  }, [pathname]);
  const base = `/sites/${slug}`;
  const links = SECTIONS.filter((s) => can(role, s.action)).map((s) => ({ href: base + s.path, label: s.label }));
  return (
    <nav aria-label="Site sections" className="mx-auto max-w-5xl px-4">
      <ul ref={list} className="-mb-px flex gap-1 overflow-x-auto">
        {links.map((link) => {
          const active = link.href === base ? pathname === base : pathname.startsWith(link.href);
          return (
            <li key={link.href}>
              <Link
                href={link.href}
                aria-current={active ? "page" : undefined}
                className={`inline-flex min-h-11 items-center border-b-2 px-3 text-sm font-medium whitespace-nowrap ${
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
