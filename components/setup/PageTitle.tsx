import Link from "next/link";
import type { ReactNode } from "react";

type PageTitleProps = { title: string; back?: { href: string; label: string }; children?: ReactNode };

/** A page's heading, with the way back above it on small screens. */
export function PageTitle({ title, back, children }: PageTitleProps) {
  return (
    <div className="flex flex-col gap-1">
      {back ? (
        <Link href={back.href} className="inline-flex min-h-11 items-center self-start text-sm font-medium text-leaf-800 hover:underline">
          <span aria-hidden="true">‹&nbsp;</span>
          {back.label}
        </Link>
      ) : null}
      <h1 className="text-2xl font-semibold text-frost-950">{title}</h1>
      {children ? <div className="text-sm text-frost-600">{children}</div> : null}
    </div>
  );
}
