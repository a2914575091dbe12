import Link from "next/link";
import { Button } from "@/components/ui/Button";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import type { ReportBucket } from "@/lib/energy/report";
import type { ReportRange } from "@/lib/energy/report-ranges";
import { REPORT_BUCKET_LABELS } from "@/lib/schemas/report";

/** Ready-made ranges as links, and any range as a plain GET form: no script needed. */
export function ReportRangeForm({
  action,
  value,
  buckets,
  choices,
}: {
  action: string;
  value: { from: string; to: string; by: ReportBucket };
  buckets: readonly ReportBucket[];
  choices: ReportRange[];
}) {
  return (
    <div className="flex flex-col gap-3">
      <ul className="flex gap-2 overflow-x-auto pb-1" aria-label="Ready-made ranges">
        {choices.map((c) => {
          const current = c.from === value.from && c.to === value.to;
          return (
            <li key={`${c.label}-${c.from}`}>
              <Link
                href={`${action}?from=${c.from}&to=${c.to}`}
                aria-current={current ? "true" : undefined}
                className={`inline-flex min-h-11 items-center rounded-full border px-4 text-sm whitespace-nowrap ${
                  current ? "border-leaf-700 bg-leaf-700 text-white" : "border-frost-300 bg-white text-frost-800 hover:bg-frost-100"
                }`}
              >
                {c.label}
              </Link>
            </li>
          );
        })}
      </ul>
      <form method="get" action={action} className="grid grid-cols-2 items-end gap-3 sm:grid-cols-[1fr_1fr_1fr_auto]">
        <label className="flex flex-col gap-1 text-sm font-medium text-frost-800">
          From
          <TextInput type="date" name="from" defaultValue={value.from} required />
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium text-frost-800">
          To
          <TextInput type="date" name="to" defaultValue={value.to} required />
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium text-frost-800">
          Group
          <Select name="by" defaultValue={value.by}>
            {buckets.map((b) => (
              <option key={b} value={b}>
                {REPORT_BUCKET_LABELS[b]}
              </option>
            ))}
          </Select>
        </label>
        <Button type="submit" variant="primary">
          Show
        </Button>
      </form>
    </div>
  );
}
