"use client";

import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { sendJson } from "@/lib/client/api";

type ConfirmButtonProps = {
  label: string;
  /** What happens, said before the person confirms. */
  warning: ReactNode;
  confirmLabel: string;
  url: string;
  method: "DELETE" | "POST";
  onDone: () => void;
};

/** A change that cannot be undone: asked once more, with what it does, before it is sent. */
export function ConfirmButton({ label, warning, confirmLabel, url, method, onDone }: ConfirmButtonProps) {
  const [asking, setAsking] = useState(false);
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function confirm() {
    setPending(true);
    setError(null);
    const result = await sendJson(url, method);
    setPending(false);
    if (!result.ok) {
      setError(result.error.message);
      return;
    }
    setAsking(false);
    onDone();
  }

  if (!asking) {
    return (
      <Button variant="secondary" className="self-start border-ember-200 text-ember-800 hover:bg-ember-50" onClick={() => setAsking(true)}>
        {label}
      </Button>
    );
  }
  return (
    <div className="flex flex-col gap-3 rounded-lg border border-ember-200 bg-ember-50 p-4 text-sm text-ember-800">
      <div>{warning}</div>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <div className="flex flex-wrap gap-2">
        <Button className="bg-ember-700 hover:bg-ember-800 active:bg-ember-800" pending={pending} pendingLabel="Working…" onClick={confirm}>
          {confirmLabel}
        </Button>
        <Button variant="secondary" onClick={() => setAsking(false)} disabled={pending}>
          Keep it
        </Button>
      </div>
    </div>
  );
}
