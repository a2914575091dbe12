"use client";

import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { Button } from "@/components/ui/Button";
import type { WindowInput } from "@/lib/schemas/schedule";
import { windowSetting } from "@/lib/schedules/format";
import { WEEKDAYS, WEEKDAY_NAMES, dayPieces, describeDays, describeTimes, timeOf, type Weekday } from "@/lib/schedules/week";
import { WINDOW_TONES } from "./window-tone";

type Props = {
  windows: WindowInput[];
  faulty: Set<number>;
  canEdit: boolean;
  onEdit: (index: number) => void;
  onRemove: (index: number, day: Weekday) => void;
  onAdd: (day: Weekday, startMin: number) => void;
  onCopy: (day: Weekday) => void;
};

/** The week as a list by day, for narrow screens: the same actions as the grid, by buttons and forms. */
export function DayList({ windows, faulty, canEdit, onEdit, onRemove, onAdd, onCopy }: Props) {
  const unit = useTemperatureUnit();
  const pieces = dayPieces(windows);
  return (
    <ol className="flex flex-col gap-3" aria-label="Time windows by day">
      {WEEKDAYS.map((day) => {
        const today = pieces.filter((p) => p.day === day).sort((a, b) => a.from - b.from);
        return (
          <li key={day} className="rounded-card border border-frost-200 bg-white p-3">
            <h3 className="text-base font-semibold text-frost-950">{WEEKDAY_NAMES[day]}</h3>
            {today.length === 0 ? <p className="mt-1 text-sm text-frost-600">No windows: the outside-windows setting applies all day.</p> : null}
            <ul className="mt-2 flex flex-col gap-2">
              {today.map((p) => {
                const w = windows[p.index]!;
                const times = p.opensHere ? describeTimes(w) : `${timeOf(p.from)}–${timeOf(p.until)}`;
                return (
                  <li
                    key={`${p.index}-${p.from}`}
                    className={`flex flex-wrap items-center gap-2 rounded-lg border-l-4 px-3 py-2 ${WINDOW_TONES[w.mode]} ${faulty.has(p.index) ? "ring-2 ring-ember-600" : ""}`}
                  >
                    <span className="min-w-0 flex-1">
                      <span className="block font-semibold">{times}</span>
                      <span className="block text-sm">
                        {windowSetting(w, unit)}
                        {p.opensHere && w.days.length > 1 ? ` · also ${describeDays(w.days.filter((d) => d !== day))}` : ""}
                        {p.opensHere ? "" : " · from the day before (edit it there)"}
                      </span>
                    </span>
                    {canEdit && p.opensHere ? (
                      <span className="flex gap-2">
                        <Button variant="secondary" onClick={() => onEdit(p.index)} aria-label={`Edit window ${p.index + 1} (${times} ${WEEKDAY_NAMES[day]})`}>
                          Edit
                        </Button>
                        <Button variant="quiet" onClick={() => onRemove(p.index, day)} aria-label={`Remove window ${p.index + 1} (${times}) from ${WEEKDAY_NAMES[day]}`}>
                          Remove
                        </Button>
                      </span>
                    ) : null}
                  </li>
                );
              })}
            </ul>
            {canEdit ? (
              <div className="mt-2 flex flex-wrap gap-2">
                <Button variant="secondary" onClick={() => onAdd(day, 6 * 60)}>
                  Add a window on {WEEKDAY_NAMES[day]}
                </Button>
                {today.some((p) => p.opensHere) ? (
                  <Button variant="quiet" onClick={() => onCopy(day)}>
                    Copy {WEEKDAY_NAMES[day]} to other days…
                  </Button>
                ) : null}
              </div>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}
