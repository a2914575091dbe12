"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ConfirmButton } from "@/components/setup/ConfirmButton";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import type { BillCheck } from "@/lib/bills/check";
import { formatMoney, formatNumber } from "@/lib/tariffs/money";
import { formatDay } from "@/lib/tariffs/validity";
import { BillBar } from "./BillBar";
import { BillForm } from "./BillForm";
import { BillUpload } from "./BillUpload";

export type BillView = {
  id: string;
  startsOn: string;
  endsOn: string;
  label: string | null;
  billedKwh: number | null;
  billedAmount: number | null;
  days: number;
  check: BillCheck;
};

type Props = {
  siteId: string;
  currency: string;
  bills: BillView[];
  canEdit: boolean;
  /** May take the printable report (the owner and the viewer). */
  canExport: boolean;
  today: string;
  tariffsHref: string;
  reportsHref: string;
};

type Open = { kind: "new" } | { kind: "upload" } | { kind: "edit"; id: string } | null;

/** Each bill beside heating's computed share; the owner enters bills one by one or from a CSV file. */
export function BillsPanel({ siteId, currency, bills, canEdit, canExport, today, tariffsHref, reportsHref }: Props) {
  const router = useRouter();
  const [open, setOpen] = useState<Open>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const done = (message: string) => {
    setOpen(null);
    setNotice(message);
    router.refresh();
  };

  return (
    <div className="flex flex-col gap-4">
      {notice ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">
          {notice}
        </p>
      ) : null}
      {canEdit && open === null ? (
        <div className="flex flex-wrap gap-2">
          <Button onClick={() => setOpen({ kind: "new" })}>Enter a bill</Button>
          <Button variant="secondary" onClick={() => setOpen({ kind: "upload" })}>
            Upload bills (CSV)
          </Button>
        </div>
      ) : null}
      {open?.kind === "new" ? (
        <Card className="p-4 sm:p-5">
          <h2 className="mb-4 text-lg font-semibold text-frost-950">New bill</h2>
          <BillForm
            siteId={siteId}
            currency={currency}
            initial={{ startsOn: "", endsOn: today, label: null, billedKwh: NaN, billedAmount: NaN }}
            onSaved={done}
            onCancel={() => setOpen(null)}
          />
        </Card>
      ) : null}
      {open?.kind === "upload" ? (
        <Card className="flex flex-col gap-3 p-4 sm:p-5">
          <h2 className="text-lg font-semibold text-frost-950">Upload bills</h2>
          <BillUpload siteId={siteId} onSaved={done} />
          <Button variant="quiet" className="self-start" onClick={() => setOpen(null)}>
            Close
          </Button>
        </Card>
      ) : null}

      {bills.length === 0 ? <p className="text-sm text-frost-700">No bills yet.{canEdit ? " Enter one to see how much of it is heating." : ""}</p> : null}
      <ul className="flex flex-col gap-4">
        {bills.map((bill) => (
          <Card as="li" key={bill.id} className="flex flex-col gap-4 p-4 sm:p-5" aria-labelledby={`bill-${bill.id}`}>
            <div>
              <h2 id={`bill-${bill.id}`} className="text-lg font-semibold text-frost-950">
                {bill.label ?? `${formatDay(bill.startsOn)} – ${formatDay(bill.endsOn)}`}
              </h2>
              <p className="text-sm text-frost-700">
                {bill.label ? `${formatDay(bill.startsOn)} – ${formatDay(bill.endsOn)} · ` : ""}
                {bill.days} days
              </p>
            </div>
            {open?.kind === "edit" && open.id === bill.id ? (
              <BillForm
                siteId={siteId}
                currency={currency}
                billId={bill.id}
                initial={{ startsOn: bill.startsOn, endsOn: bill.endsOn, label: bill.label, billedKwh: bill.billedKwh ?? NaN, billedAmount: bill.billedAmount ?? NaN }}
                onSaved={done}
                onCancel={() => setOpen(null)}
              />
            ) : (
              <BillComparison bill={bill} currency={currency} canEdit={canEdit} tariffsHref={tariffsHref} />
            )}
            <nav aria-label={`This bill's period`} className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
              <Link className="font-medium text-leaf-800 underline underline-offset-2" href={`${reportsHref}?from=${bill.startsOn}&to=${bill.endsOn}`}>
                The report for these dates
              </Link>
              {canExport ? (
                <a
                  className="font-medium text-leaf-800 underline underline-offset-2"
                  href={`/api/sites/${siteId}/reports/energy/pdf?from=${bill.startsOn}&to=${bill.endsOn}&by=${bill.days <= 62 ? "day" : "week"}`}
                  download
                >
                  Printable report (PDF)
                </a>
              ) : null}
            </nav>
            {canEdit && !(open?.kind === "edit" && open.id === bill.id) ? (
              <div className="flex flex-wrap gap-2 border-t border-frost-100 pt-3">
                <Button variant={bill.billedKwh === null ? "primary" : "secondary"} onClick={() => setOpen({ kind: "edit", id: bill.id })} disabled={open !== null}>
                  {bill.billedKwh === null ? "Enter the bill’s figures" : "Change"}
                </Button>
                <ConfirmButton
                  label="Remove"
                  confirmLabel="Remove this bill"
                  url={`/api/sites/${siteId}/bills/${bill.id}`}
                  method="DELETE"
                  onDone={() => done("Bill removed.")}
                  warning={<p>The bill’s dates and figures go; heating’s kWh and costs stay in the reports.</p>}
                />
              </div>
            ) : null}
          </Card>
        ))}
      </ul>
    </div>
  );
}

function BillComparison({ bill, currency, canEdit, tariffsHref }: { bill: BillView; currency: string; canEdit: boolean; tariffsHref: string }) {
  const { heating, rest, notes } = bill.check;
  const money = (v: number | null) => (v === null ? "—" : formatMoney(v, currency));
  const warning = rest !== null && rest.kwh < 0 ? notes[0] : null;
  const otherNotes = warning ? notes.slice(1) : notes;
  return (
    <div className="flex flex-col gap-3">
      {bill.billedKwh === null ? (
        <Notice tone="info">
          {canEdit ? "Enter what this bill says (kWh and amount) to see how much of it is heating." : "The bill’s own figures have not been entered yet; the site’s owner can add them."}
        </Notice>
      ) : null}
      <div className="overflow-x-auto">
        <table className="w-full max-w-2xl min-w-[18rem] text-left text-sm">
          <caption className="sr-only">The bill beside heating’s computed share</caption>
          <thead className="text-xs text-frost-600">
            <tr>
              <th className="py-1 pr-2 font-medium">
                <span className="sr-only">Figure</span>
              </th>
              <th className="py-1 pr-2 text-right font-medium">On the bill</th>
              <th className="py-1 pr-2 text-right font-medium">Heating</th>
              <th className="py-1 text-right font-medium">Everything else</th>
            </tr>
          </thead>
          <tbody className="whitespace-nowrap tabular-nums">
            <tr className="border-t border-frost-100">
              <th scope="row" className="py-1.5 pr-2 font-medium text-frost-800">
                kWh
              </th>
              <td className="py-1.5 pr-2 text-right">{bill.billedKwh === null ? "—" : formatNumber(bill.billedKwh)}</td>
              <td className="py-1.5 pr-2 text-right">{formatNumber(heating.kwh)}</td>
              <td className={`py-1.5 text-right ${rest && rest.kwh < 0 ? "font-semibold text-ember-700" : ""}`}>{rest ? formatNumber(rest.kwh) : "—"}</td>
            </tr>
            <tr className="border-t border-frost-100">
              <th scope="row" className="py-1.5 pr-2 font-medium text-frost-800">
                Amount
              </th>
              <td className="py-1.5 pr-2 text-right">{money(bill.billedAmount)}</td>
              <td className="py-1.5 pr-2 text-right">{money(heating.total)}</td>
              <td className={`py-1.5 text-right ${rest?.amount !== null && rest?.amount !== undefined && rest.amount < 0 ? "font-semibold text-ember-700" : ""}`}>{rest ? money(rest.amount) : "—"}</td>
            </tr>
          </tbody>
        </table>
      </div>
      <p className="text-xs text-frost-600">
        Heating’s amount is its energy ({money(heating.energyCost ?? 0)}) plus the standing charge for the days counted ({money(heating.standingCharge)}), tax included, from the{" "}
        <a href={tariffsHref} className="font-medium text-leaf-800 underline">
          tariffs
        </a>{" "}
        of each day.
      </p>
      {bill.billedKwh !== null ? <BillBar billedKwh={bill.billedKwh} heatingKwh={heating.kwh} /> : null}
      {warning ? <Notice tone="caution">{warning}</Notice> : null}
      {otherNotes.map((n) => (
        <p key={n} className="text-sm text-frost-700">
          {n}
        </p>
      ))}
    </div>
  );
}
