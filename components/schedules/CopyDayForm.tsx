"use client";

import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { WEEKDAYS, WEEKDAY_NAMES, type Weekday } from "@/lib/schedules/week";

type Props = { from: Weekday; onCopy: (to: Weekday[]) => void; onCancel: () => void };

/** Gives other days the chosen day's windows in place of their own. */
export function CopyDayForm({ from, onCopy, onCancel }: Props) {
  const [to, setTo] = useState<Weekday[]>([]);
  return (
    <form
      className="flex flex-col gap-3 rounded-card border border-leaf-300 bg-white p-4 shadow-md"
      onSubmit={(e) => {
        e.preventDefault();
        if (to.length) onCopy(to);
      }}
    >
      <fieldset className="flex flex-col gap-2">
        <legend className="text-base font-semibold text-frost-950">Copy {WEEKDAY_NAMES[from]}’s windows to</legend>
        <p className="text-sm text-frost-600">The days you pick lose their own windows and get {WEEKDAY_NAMES[from]}’s.</p>
        <div className="flex flex-wrap gap-2">
          {WEEKDAYS.filter((d) => d !== from).map((d) => (
            <label key={d} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-frost-300 px-3 text-sm has-checked:border-leaf-700 has-checked:bg-leaf-50">
              <input
                type="checkbox"
                className="size-4 accent-leaf-700"
                checked={to.includes(d)}
                onChange={(e) => setTo(e.target.checked ? [...to, d] : to.filter((x) => x !== d))}
              />
              {WEEKDAY_NAMES[d]}
            </label>
          ))}
        </div>
      </fieldset>
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={to.length === 0}>
          Copy
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
