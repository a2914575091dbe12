import type { ReactNode } from "react";
import { Card } from "@/components/ui/Card";

/** A house's rules, folded to one line so a site's houses fit a phone's screen; opened to read or change. */
export function HouseRulesPanel({ houseId, name, saved, open, children }: { houseId: string; name: string; saved: boolean; open: boolean; children: ReactNode }) {
  const headingId = `rules-${houseId}-heading`;
  return (
    <Card as="section" className="p-4 sm:p-5" aria-labelledby={headingId}>
      <details open={open} className="group">
        <summary className="flex min-h-11 cursor-pointer list-none items-center justify-between gap-3 [&::-webkit-details-marker]:hidden">
          <h2 id={headingId} className="text-lg font-semibold text-frost-950">
            {name}
          </h2>
          <span className="flex shrink-0 items-center gap-2 text-sm text-frost-700">
            {saved ? "Own rules" : "Default rules"}
            <span aria-hidden="true" className="text-lg leading-none transition-transform group-open:rotate-180">
              ▾
            </span>
          </span>
        </summary>
        <div className="mt-4">{children}</div>
      </details>
    </Card>
  );
}
