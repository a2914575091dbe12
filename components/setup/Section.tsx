import type { ReactNode } from "react";
import { Card } from "@/components/ui/Card";

/** A titled card of a set-up page. */
export function Section({ title, children, id }: { title: string; children: ReactNode; id?: string }) {
  const headingId = `${id ?? title.toLowerCase().replace(/[^a-z]+/g, "-")}-heading`;
  return (
    <Card as="section" className="flex flex-col gap-4 p-4 sm:p-5" aria-labelledby={headingId}>
      <h2 id={headingId} className="text-lg font-semibold text-frost-950">
        {title}
      </h2>
      {children}
    </Card>
  );
}
