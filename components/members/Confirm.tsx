"use client";

import { useState, type ReactNode } from "react";
import { Button } from "@/components/ui/Button";

/**
 * A button that asks once more before it acts: the first press shows the question and
 * two large answers in its place.
 */
export function ConfirmButton({
  label,
  question,
  confirmLabel,
  pendingLabel,
  onConfirm,
}: {
  label: string;
  question: ReactNode;
  confirmLabel: string;
  pendingLabel: string;
  onConfirm: () => Promise<void>;
}) {
  const [asking, setAsking] = useState(false);
  const [pending, setPending] = useState(false);
  if (!asking) {
    return (
      <Button variant="secondary" onClick={() => setAsking(true)}>
        {label}
      </Button>
    );
  }
  return (
    <div role="group" aria-label={label} className="flex flex-col gap-2 rounded-lg border border-ember-200 bg-ember-50 p-3">
      <p className="text-sm text-ember-800">{question}</p>
      <div className="flex flex-wrap gap-2">
        <Button
          className="bg-ember-700 hover:bg-ember-800 active:bg-ember-900"
          pending={pending}
          pendingLabel={pendingLabel}
          onClick={async () => {
            setPending(true);
            try {
              await onConfirm();
            } finally {
              setPending(false);
              setAsking(false);
            }
          }}
        >
          {confirmLabel}
        </Button>
        <Button variant="secondary" onClick={() => setAsking(false)} disabled={pending}>
          Keep
        </Button>
      </div>
    </div>
  );
}
