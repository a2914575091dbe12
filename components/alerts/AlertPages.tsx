import Link from "next/link";

const PAGES = [
  { path: "", label: "Alerts" },
  { path: "/settings", label: "Rules" },
  { path: "/mine", label: "My e-mails" },
] as const;

/** The three alert pages, side by side under the title; large targets for a gloved thumb. */
export function AlertPages({ slug, current }: { slug: string; current: "" | "/settings" | "/mine" }) {
  return (
    <nav aria-label="Alert pages" className="flex gap-2 overflow-x-auto">
      {PAGES.map((p) => (
        <Link
          key={p.path}
          href={`/sites/${slug}/alerts${p.path}`}
          aria-current={p.path === current ? "page" : undefined}
          className={`inline-flex min-h-11 shrink-0 items-center rounded-lg px-4 text-sm font-semibold ${
            p.path === current ? "bg-leaf-700 text-white" : "border border-frost-300 bg-white text-frost-900 hover:bg-frost-100"
          }`}
        >
          {p.label}
        </Link>
      ))}
    </nav>
  );
}
