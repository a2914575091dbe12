"use client";

import { useId, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/Button";
import { FileRefusal } from "@/components/ui/FileRefusal";
import { BILL_CSV_LIMITS } from "@/lib/schemas/bill";

type Problem = { line: number; message: string };
type Counts = { created: number; updated: number; unchanged: number; bills: number };

/** Bills from a CSV file: all saved, or none with each bad line named. */
export function BillUpload({ siteId, onSaved }: { siteId: string; onSaved: (message: string) => void }) {
  const inputId = useId();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [rows, setRows] = useState<Problem[]>([]);

  async function upload(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setError(null);
    setRows([]);
    const file = (event.currentTarget.elements.namedItem("file") as HTMLInputElement).files?.[0];
    if (!file) return setError("Choose a CSV file first.");
    if (file.size > BILL_CSV_LIMITS.maxChars) {
      return setError(`That file is ${Math.ceil(file.size / 1000)} kB; a bill file may be at most ${BILL_CSV_LIMITS.maxChars / 1000} kB (${BILL_CSV_LIMITS.maxRows} bills).`);
    }
    setPending(true);
    const csv = await file.text();
    const response = await fetch(`/api/sites/${siteId}/bills/upload`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ csv }) }).catch(() => null);
    setPending(false);
    if (!response) return setError("Could not reach Cloche. Check your connection and try again.");
    const body = (await response.json().catch(() => null)) as (Counts & { error?: { message: string }; rows?: Problem[] }) | null;
    if (!response.ok || !body) {
      setError(body?.error?.message?.replace(/^csv: /, "") ?? `Cloche answered with status ${response.status}. Please try again.`);
      setRows(body?.rows ?? []);
      return;
    }
    const parts = [`${body.created} added`, `${body.updated} updated`, `${body.unchanged} already up to date`];
    onSaved(`Read ${body.bills} ${body.bills === 1 ? "bill" : "bills"} from ${file.name}: ${parts.join(", ")}.`);
    (event.target as HTMLFormElement).reset();
  }

  return (
    <form onSubmit={upload} className="flex flex-col gap-3" noValidate>
      <p className="text-sm text-frost-700">
        A CSV file with a first line naming the columns <code className="rounded bg-frost-100 px-1">from,to,kwh,amount</code> and optionally{" "}
        <code className="rounded bg-frost-100 px-1">label</code>, then one bill per line: dates as 2026-09-01, numbers with a decimal point (1840.5). A bill whose dates are already here is updated, so
        uploading the same file again changes nothing.
      </p>
      <label htmlFor={inputId} className="text-sm font-medium text-frost-900">
        Bills file
      </label>
      <input
        id={inputId}
        name="file"
        type="file"
        accept=".csv,text/csv"
        className="block min-h-11 w-full text-sm text-frost-900 file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-frost-300 file:bg-white file:px-4 file:font-semibold file:text-frost-900"
      />
      {error ? <FileRefusal message={error} lines={rows} /> : null}
      <Button type="submit" className="self-start" pending={pending} pendingLabel="Reading…">
        Upload bills
      </Button>
    </form>
  );
}
