"use client";

import { useState } from "react";
import { Notice } from "@/components/ui/Notice";
import { CONFIRM_WAIT_MS, type Confirmation } from "./confirmation";
import { errorMessage, panelUrl, type OverrideViewJson } from "./panel-data";
import { formatSiteTime } from "./time";

const CONFIRMATION_TEXT: Record<Confirmation["kind"], { text: (on: boolean) => string; box: string }> = {
  confirmed: { text: (on) => `Confirmed: the plug reports ${on ? "on" : "off"}.`, box: "border-leaf-700 bg-leaf-50 text-leaf-900" },
  waiting: { text: (on) => `Sent — waiting for the plug to report ${on ? "on" : "off"}…`, box: "border-frost-400 bg-frost-100 text-frost-900" },
  offline: {
    text: () => "The plug is offline: it has not confirmed. It will switch when it is heard again.",
    box: "border-ember-600 bg-ember-50 text-ember-900",
  },
  no_answer: {
    text: () => `The plug has not answered in ${CONFIRM_WAIT_MS / 1000} s: it has not confirmed the switch. Check its power and Wi-Fi.`,
    box: "border-ember-600 bg-ember-50 text-ember-900",
  },
};

type Props = {
  siteId: string;
  plugId: string;
  override: OverrideViewJson;
  confirmation: Confirmation | null;
  canCancel: boolean;
  now: Date;
  timeZone: string;
  onCancelled: () => void;
};

/** The override in force: what, until when, whether the plug confirmed it, and its cancel button. */
export function ActiveOverride({ siteId, plugId, override, confirmation, canCancel, now, timeZone, onCancelled }: Props) {
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);
  const stops = override.stopsAt ? new Date(override.stopsAt) : null;

  async function cancel() {
    setBusy(true);
    setFailure(null);
    try {
      const response = await fetch(`${panelUrl(siteId, plugId)}/${encodeURIComponent(override.id)}`, { method: "DELETE" });
      if (!response.ok) setFailure(await errorMessage(response));
      else onCancelled();
    } catch {
      setFailure("Cloche can’t be reached from this device right now. The override is still in force.");
    } finally {
      setBusy(false);
    }
  }

  const shown = confirmation ? CONFIRMATION_TEXT[confirmation.kind] : null;
  return (
    <section aria-labelledby="active-override" className="rounded-xl border-2 border-leaf-700 bg-white p-4">
      <h2 id="active-override" className="text-lg font-semibold text-frost-950">
        Overridden {override.on ? "on" : "off"}
      </h2>
      <p className="mt-1 text-base text-frost-800">
        {stops
          ? `Until ${formatSiteTime(stops, now, timeZone)}${override.untilNextChange ? ", when the schedule changes" : ""}`
          : "Until cancelled"}
        {override.byName ? ` · by ${override.byName}` : ""}
      </p>
      {override.reason ? <p className="mt-1 text-base text-frost-800">“{override.reason}”</p> : null}
      {shown && confirmation ? (
        <p
          data-confirmation={confirmation.kind}
          aria-live="assertive"
          className={`mt-3 rounded-lg border-2 px-3 py-2 text-lg font-semibold ${shown.box}`}
        >
          {confirmation.kind === "confirmed" && confirmation.already ? `Confirmed: the plug was already ${override.on ? "on" : "off"}.` : shown.text(override.on)}
        </p>
      ) : null}
      {failure ? (
        <div className="mt-3">
          <Notice tone="error">{failure}</Notice>
        </div>
      ) : null}
      {canCancel ? (
        <button
          type="button"
          onClick={cancel}
          disabled={busy}
          className="mt-4 min-h-16 w-full rounded-2xl border-4 border-frost-800 bg-white text-xl font-bold text-frost-950 active:bg-frost-100 disabled:opacity-60"
        >
          {busy ? "Cancelling…" : "Cancel override — back to the schedule"}
        </button>
      ) : null}
    </section>
  );
}
