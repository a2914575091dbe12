"use client";

import { useState } from "react";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { formatAgo, formatSiteTime } from "@/components/houses/live-format";
import { sendJson } from "@/lib/client/api";
import { ALERT_KIND_LABELS } from "@/lib/domain";
import { MAIL_PURPOSE_WORDS, alertFigures, clearedFigures, deliveryInTrouble, deliveryWords, type AlertJson } from "./alert-words";

type Props = {
  alert: AlertJson;
  siteId: string;
  timeZone: string;
  now: Date;
  /** May this person acknowledge (owner, grower, helper)? */
  canAcknowledge: boolean;
  onChanged?: () => void;
};

const urgent = new Set(["too_cold", "too_hot", "overload", "controller_silent"]);

/** One alert as a card: what, where, the figures in the reader's unit, who has seen it, and its e-mails. */
export function AlertCard({ alert, siteId, timeZone, now, canAcknowledge, onChanged }: Props) {
  const unit = useTemperatureUnit();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const open = alert.clearedAt === null;
  const raised = new Date(alert.raisedAt);
  const figures = alertFigures(alert.detail, unit);
  const where = [alert.sensor?.name ?? alert.detail.sensorName, alert.plug?.name ?? alert.detail.plugName].filter(Boolean).join(" · ");
  const houseName = alert.house?.name ?? alert.detail.houseName;
  const trouble = alert.deliveries.some(deliveryInTrouble);
  const back = clearedFigures(alert.detail, unit);

  async function acknowledge() {
    setPending(true);
    setError(null);
    const result = await sendJson(`/api/sites/${siteId}/alerts/${alert.id}/acknowledge`, "POST");
    setPending(false);
    if (!result.ok) setError(result.error.message);
    onChanged?.();
  }

  return (
    <Card as="li" className={`flex flex-col gap-3 p-4 ${open ? "border-l-4 " + (urgent.has(alert.kind) ? "border-l-ember-500" : "border-l-soil-400") : ""}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
        <h3 className="text-base font-semibold text-frost-950">
          {ALERT_KIND_LABELS[alert.kind] ?? alert.kind}
          {houseName ? <span className="font-normal text-frost-700"> in {houseName}</span> : null}
        </h3>
        <span className="text-sm text-frost-700">
          {open ? (alert.acknowledgedAt ? "Open, seen" : "Open") : "Back to normal"}
        </span>
      </div>
      {where ? <p className="-mt-2 text-sm text-frost-700">{where}</p> : null}
      <p className="text-sm text-frost-900">{alert.message}</p>
      {figures.length ? (
        <ul className="flex flex-col gap-0.5 text-sm text-frost-800">
          {figures.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      ) : null}
      <p className="text-sm text-frost-700">
        Raised <time dateTime={alert.raisedAt}>{formatSiteTime(raised, now, timeZone)}</time> ({formatAgo(raised, now)})
      </p>
      {alert.clearedAt ? (
        <p className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-900">
          Back to normal <time dateTime={alert.clearedAt}>{formatSiteTime(new Date(alert.clearedAt), now, timeZone)}</time>
          {alert.clearedMessage ? `: ${alert.clearedMessage}` : ""}
          {back ? ` (${back})` : ""}
        </p>
      ) : null}
      {alert.acknowledgedAt ? (
        <p className="text-sm text-frost-700">
          Acknowledged by {alert.acknowledgedBy} at <time dateTime={alert.acknowledgedAt}>{formatSiteTime(new Date(alert.acknowledgedAt), now, timeZone)}</time>
        </p>
      ) : open && canAcknowledge ? (
        <div className="flex flex-col gap-1">
          <Button variant="secondary" className="w-full sm:w-auto sm:self-start" pending={pending} pendingLabel="Acknowledging…" onClick={() => void acknowledge()}>
            Acknowledge
          </Button>
          <p className="text-xs text-frost-600">Tells the others you are on it; reminders stop.</p>
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="text-sm text-ember-700">
          {error}
        </p>
      ) : null}
      <Deliveries alert={alert} now={now} timeZone={timeZone} open={trouble} />
    </Card>
  );
}

function Deliveries({ alert, now, timeZone, open }: { alert: AlertJson; now: Date; timeZone: string; open: boolean }) {
  const list = alert.deliveries;
  if (list.length === 0) return <p className="text-xs text-frost-600">No e-mails for this alert yet.</p>;
  const sent = list.filter((d) => d.status === "sent").length;
  return (
    <details open={open} className="group rounded-lg bg-frost-50 px-3 text-sm">
      <summary className="flex min-h-11 cursor-pointer items-center justify-between gap-2 text-frost-800">
        <span>
          E-mails: {sent} of {list.length} sent
          {open ? <span className="font-medium text-ember-700"> · some not through</span> : null}
        </span>
        <span aria-hidden="true" className="transition-transform group-open:rotate-180">
          ▾
        </span>
      </summary>
      <ul className="flex flex-col gap-2 pb-3">
        {list.map((d) => (
          <li key={d.id} className={deliveryInTrouble(d) ? "text-ember-800" : "text-frost-800"}>
            <span className="font-medium">{MAIL_PURPOSE_WORDS[d.purpose]}</span> to {d.name ?? d.to}
            {d.name ? <span className="text-frost-600"> ({d.to})</span> : null}: {deliveryWords(d, now, timeZone)}
          </li>
        ))}
      </ul>
    </details>
  );
}
