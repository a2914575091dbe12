"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ConfirmButton } from "@/components/setup/ConfirmButton";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Notice } from "@/components/ui/Notice";
import { TARIFF_KIND_LABELS } from "@/lib/domain";
import type { TariffInput } from "@/lib/schemas/tariff";
import { describeDays } from "@/lib/schedules/week";
import { formatMoney, formatUnitPrice } from "@/lib/tariffs/money";
import { describeValidity, formatDay } from "@/lib/tariffs/validity";
import { coverageProblems, tariffWeek } from "@/lib/tariffs/week";
import { TariffForm, blankTariff } from "./TariffForm";
import { TariffWeek } from "./TariffWeek";

type Tariff = TariffInput & { id: string };

type Props = {
  siteId: string;
  currency: string;
  tariffs: Tariff[];
  currentTariffId: string | null;
  today: string;
  canEdit: boolean;
};

/** The site's tariffs, the current one first marked, each with its rates; the owner adds, changes and removes them. */
export function TariffsPanel({ siteId, currency, tariffs, currentTariffId, today, canEdit }: Props) {
  const router = useRouter();
  const [editing, setEditing] = useState<string | "new" | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  const done = (message: string) => {
    setEditing(null);
    setNotice(message);
    router.refresh();
  };

  // A new tariff starts the day after the latest one ends, or today (the list is newest first).
  const latestEnd = tariffs[0]?.validUntil ?? null;
  const nextStart = latestEnd && latestEnd >= today ? nextDate(latestEnd) : today;

  return (
    <div className="flex flex-col gap-4">
      {notice ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">
          {notice}
        </p>
      ) : null}
      {currentTariffId === null ? (
        <p className="rounded-lg border border-soil-200 bg-soil-50 px-3 py-2.5 text-sm text-soil-800">
          No tariff covers today, so heating since {tariffs.length ? "the last tariff ended" : "the start"} has kWh but no cost.
          {canEdit ? " Add one to see costs." : " The site’s owner can add one."}
        </p>
      ) : null}

      {canEdit && editing === null ? (
        <Button className="self-start" onClick={() => setEditing("new")}>
          Add a tariff
        </Button>
      ) : null}
      {editing === "new" ? (
        <Card className="p-4 sm:p-5">
          <h2 className="mb-4 text-lg font-semibold text-frost-950">New tariff</h2>
          <TariffForm siteId={siteId} currency={currency} initial={blankTariff(nextStart)} onSaved={done} onCancel={() => setEditing(null)} />
        </Card>
      ) : null}

      {tariffs.length === 0 && editing !== "new" ? <p className="text-sm text-frost-700">No tariffs yet.</p> : null}

      <ul className="flex flex-col gap-4">
        {tariffs.map((t) => (
          <Card as="li" key={t.id} className="flex flex-col gap-4 p-4 sm:p-5" aria-labelledby={`tariff-${t.id}`}>
            {editing === t.id ? (
              <>
                <h2 id={`tariff-${t.id}`} className="text-lg font-semibold text-frost-950">
                  Change “{t.name}”
                </h2>
                <TariffForm siteId={siteId} currency={currency} tariffId={t.id} initial={t} onSaved={done} onCancel={() => setEditing(null)} />
              </>
            ) : (
              <TariffSummary tariff={t} currency={currency} current={t.id === currentTariffId} />
            )}
            {canEdit && editing !== t.id ? (
              <div className="flex flex-wrap gap-2 border-t border-frost-100 pt-3">
                <Button variant="secondary" onClick={() => setEditing(t.id)} disabled={editing !== null}>
                  Change
                </Button>
                <ConfirmButton
                  label="Remove"
                  confirmLabel={`Remove “${t.name}”`}
                  url={`/api/sites/${siteId}/tariffs/${t.id}`}
                  method="DELETE"
                  onDone={() => done(`Removed “${t.name}”.`)}
                  warning={
                    <p>
                      Heating on {describeValidity(t).replace(/^from/, "days from")} will have kWh but no cost in the reports and bill checks, until another tariff covers those days. Switch
                      history and kWh are kept.
                    </p>
                  }
                />
              </div>
            ) : null}
          </Card>
        ))}
      </ul>
    </div>
  );
}

function nextDate(day: string): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

function TariffSummary({ tariff: t, currency, current }: { tariff: Tariff; currency: string; current: boolean }) {
  // Rows stored by other means than the editor (an import, the demo) may not cover the week once.
  const problems = t.kind === "time_of_use" ? coverageProblems(tariffWeek(t.kind, t.rates), t.rates.map((r) => r.label)) : [];
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 id={`tariff-${t.id}`} className="text-lg font-semibold text-frost-950">
            {t.name}
          </h2>
          <p className="text-sm text-frost-700">
            {TARIFF_KIND_LABELS[t.kind]} · {t.validUntil === null ? `from ${formatDay(t.validFrom)}, no end date` : `${formatDay(t.validFrom)} to ${formatDay(t.validUntil)}`}
          </p>
        </div>
        {current ? <span className="rounded-full bg-leaf-700 px-3 py-1 text-xs font-semibold text-white">In force today</span> : null}
      </div>
      <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-xs text-frost-600">Standing charge</dt>
          <dd className="text-frost-950">{formatMoney(t.standingChargePerDay, currency)} a day</dd>
        </div>
        <div>
          <dt className="text-xs text-frost-600">Tax</dt>
          <dd className="text-frost-950">{t.taxPercent} %</dd>
        </div>
      </dl>
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Unit rates of {t.name}, before tax</caption>
        <thead className="text-xs text-frost-600">
          <tr>
            <th className="py-1 pr-2 font-medium">Rate</th>
            {t.kind === "time_of_use" ? (
              <>
                <th className="py-1 pr-2 font-medium">Times</th>
                <th className="py-1 pr-2 font-medium">Days</th>
              </>
            ) : null}
            <th className="py-1 text-right font-medium">Per kWh</th>
          </tr>
        </thead>
        <tbody>
          {t.rates.map((r, i) => (
            <tr key={i} className="border-t border-frost-100">
              <td className="py-1.5 pr-2 text-frost-950">{r.label}</td>
              {t.kind === "time_of_use" ? (
                <>
                  <td className="py-1.5 pr-2 tabular-nums">
                    {r.startsAt}–{r.endsAt}
                    {r.endsAt <= r.startsAt ? <span className="text-frost-600"> (next day)</span> : null}
                  </td>
                  <td className="py-1.5 pr-2">{describeDays(r.days)}</td>
                </>
              ) : null}
              <td className="py-1.5 text-right tabular-nums">{formatUnitPrice(r.pricePerKwh, currency)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {problems.length ? (
        <Notice tone="caution">
          <p className="font-medium">These rates do not cover the week once, so reports leave some hours without a price or take the earlier-starting rate:</p>
          <ul className="mt-1 list-disc pl-5">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </Notice>
      ) : null}
      {t.kind === "time_of_use" ? <TariffWeek kind={t.kind} rates={t.rates} /> : null}
    </div>
  );
}
