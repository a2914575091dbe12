import type { ReactNode } from "react";

type Tone = "error" | "info" | "caution";

const tones: Record<Tone, string> = {
  error: "border-ember-200 bg-ember-50 text-ember-800",
  caution: "border-soil-200 bg-soil-50 text-soil-800",
  info: "border-frost-200 bg-frost-100 text-frost-800",
};

/** A boxed message; errors are announced to screen readers as they appear. */
export function Notice({ tone = "info", children }: { tone?: Tone; children: ReactNode }) {
  return (
    <div role={tone === "error" ? "alert" : undefined} className={`rounded-lg border px-3 py-2.5 text-sm ${tones[tone]}`}>
      {children}
    </div>
  );
}
