"use client";

import { useEffect, useRef, useState, type KeyboardEvent, type PointerEvent } from "react";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import type { WindowInput } from "@/lib/schemas/schedule";
import type { PlanAction } from "@/lib/schedules/edit";
import { moveWindow, resizeWindow } from "@/lib/schedules/edit";
import { describeWindow, windowSetting } from "@/lib/schedules/format";
import { DAY_MIN, SNAP_MIN, WEEKDAYS, WEEKDAY_NAMES, WEEKDAY_SHORT, dayPieces, describeTimes, type Weekday } from "@/lib/schedules/week";
import { WINDOW_TONES } from "./window-tone";

const HOUR_PX = 28;
const PX_PER_MIN = HOUR_PX / 60;

type Props = {
  windows: WindowInput[];
  /** Windows with a problem (their places in the list). */
  faulty: Set<number>;
  canEdit: boolean;
  dispatch: (action: PlanAction) => void;
  onEdit: (index: number) => void;
  onAdd: (day: Weekday, startMin: number) => void;
  announce: (message: string) => void;
};

type Drag = { index: number; kind: "move" | "resize"; x: number; y: number; colWidth: number; minutes: number; days: number; moved: boolean };

const snap = (minutes: number) => Math.round(minutes / SNAP_MIN) * SNAP_MIN;

/**
 * The week as columns (Mon–Sun) with time running down. A window is drawn on each of
 * its days, across midnight into the next day's column. Drag a window to move it (all
 * its days), drag its lower edge to resize it; or focus it and use the keyboard.
 */
export function WeekGrid({ windows, faulty, canEdit, dispatch, onEdit, onAdd, announce }: Props) {
  const unit = useTemperatureUnit();
  const [drag, setDrag] = useState<Drag | null>(null);
  const columns = useRef<HTMLDivElement>(null);
  // A moved window is drawn anew (maybe in another column): keep the keyboard on it.
  const refocus = useRef<{ index: number; day: Weekday } | null>(null);
  useEffect(() => {
    if (refocus.current === null) return;
    const { index, day } = refocus.current;
    const grid = columns.current;
    (grid?.querySelector<HTMLElement>(`[data-day="${day}"] [data-window="${index}"][data-opens]`) ?? grid?.querySelector<HTMLElement>(`[data-window="${index}"][data-opens]`))?.focus();
    refocus.current = null;
  });

  // While dragging, the window is drawn where it would land.
  const shown = windows.map((w, i) =>
    drag && drag.index === i ? (drag.kind === "move" ? moveWindow(w, drag.minutes, drag.days) : resizeWindow(w, drag.minutes)) : w,
  );
  const pieces = dayPieces(shown);

  function onKeyDown(e: KeyboardEvent<HTMLButtonElement>, index: number, day: Weekday) {
    if (!canEdit) return;
    const w = windows[index]!;
    let action: PlanAction | null = null;
    if (e.key === "Enter") {
      e.preventDefault();
      onEdit(index);
      return;
    }
    if (e.key === "Delete" || e.key === "Backspace") {
      e.preventDefault();
      dispatch({ type: "remove", index });
      announce(`Removed ${describeWindow(w, unit)}`);
      return;
    }
    const step = e.key === "ArrowUp" ? -SNAP_MIN : e.key === "ArrowDown" ? SNAP_MIN : 0;
    if (step && e.shiftKey) action = { type: "resize", index, minutes: step };
    else if (step) action = { type: "move", index, minutes: step, days: 0 };
    else if (e.key === "ArrowLeft" || e.key === "ArrowRight") action = { type: "move", index, minutes: 0, days: e.key === "ArrowLeft" ? -1 : 1 };
    if (!action) return;
    e.preventDefault();
    dispatch(action);
    // The same day's opening of the window, wherever the move took it.
    refocus.current = { index, day: action.type === "move" ? moveWindow({ ...w, days: [day] }, action.minutes, action.days).days[0]! : day };
    const after = action.type === "resize" ? resizeWindow(w, action.minutes) : moveWindow(w, action.minutes, action.days);
    announce(`${action.type === "resize" ? "Resized" : "Moved"}: ${describeWindow(after, unit)}`);
  }

  function startDrag(e: PointerEvent<HTMLElement>, index: number, kind: Drag["kind"]) {
    if (!canEdit || e.button !== 0) return;
    e.stopPropagation();
    e.currentTarget.setPointerCapture(e.pointerId);
    const colWidth = (columns.current?.getBoundingClientRect().width ?? 700) / 7;
    setDrag({ index, kind, x: e.clientX, y: e.clientY, colWidth, minutes: 0, days: 0, moved: false });
  }

  function onPointerMove(e: PointerEvent<HTMLElement>) {
    if (!drag) return;
    const minutes = snap((e.clientY - drag.y) / PX_PER_MIN);
    const days = drag.kind === "move" ? Math.round((e.clientX - drag.x) / drag.colWidth) : 0;
    if (minutes !== drag.minutes || days !== drag.days) setDrag({ ...drag, minutes, days, moved: true });
  }

  function endDrag() {
    if (!drag) return;
    const w = windows[drag.index]!;
    if (drag.moved && (drag.minutes !== 0 || drag.days !== 0)) {
      if (drag.kind === "move") {
        dispatch({ type: "move", index: drag.index, minutes: drag.minutes, days: drag.days });
        announce(`Moved: ${describeWindow(moveWindow(w, drag.minutes, drag.days), unit)}`);
      } else {
        dispatch({ type: "resize", index: drag.index, minutes: drag.minutes });
        announce(`Resized: ${describeWindow(resizeWindow(w, drag.minutes), unit)}`);
      }
    } else if (!drag.moved && drag.kind === "move") {
      onEdit(drag.index);
    }
    setDrag(null);
  }

  function onColumnClick(e: React.MouseEvent<HTMLDivElement>, day: Weekday) {
    if (!canEdit || e.target !== e.currentTarget) return;
    const y = e.clientY - e.currentTarget.getBoundingClientRect().top;
    onAdd(day, Math.min(DAY_MIN - 60, Math.max(0, Math.floor(y / PX_PER_MIN / 60) * 60)));
  }

  return (
    <div className="overflow-x-auto">
      <div className="min-w-[40rem]">
        <div className="grid grid-cols-[3rem_repeat(7,1fr)] border-b border-frost-200 text-center text-sm font-semibold text-frost-800">
          <span />
          {WEEKDAYS.map((d) => (
            <span key={d} className="py-2">
              <abbr title={WEEKDAY_NAMES[d]} className="no-underline">
                {WEEKDAY_SHORT[d]}
              </abbr>
            </span>
          ))}
        </div>
        <div className="grid grid-cols-[3rem_1fr]">
          <div className="relative" style={{ height: 24 * HOUR_PX }} aria-hidden>
            {Array.from({ length: 12 }, (_, i) => (
              <span key={i} className="absolute right-1 -translate-y-1/2 text-xs text-frost-600" style={{ top: i * 2 * HOUR_PX }}>
                {String(i * 2).padStart(2, "0")}:00
              </span>
            ))}
          </div>
          <div ref={columns} className="grid grid-cols-7" role="group" aria-label="Week of time windows">
            {WEEKDAYS.map((day) => (
              <div
                key={day}
                data-day={day}
                onClick={(e) => onColumnClick(e, day)}
                className={`relative border-l border-frost-200 ${canEdit ? "cursor-copy" : ""}`}
                style={{
                  height: 24 * HOUR_PX,
                  backgroundImage: `repeating-linear-gradient(to bottom, transparent 0, transparent ${2 * HOUR_PX - 1}px, var(--color-frost-100, #eceff2) ${2 * HOUR_PX - 1}px, var(--color-frost-100, #eceff2) ${2 * HOUR_PX}px)`,
                }}
              >
                {pieces
                  .filter((p) => p.day === day)
                  .map((p) => {
                    const w = shown[p.index]!;
                    const opened = p.opensHere ? WEEKDAY_NAMES[day] : `${WEEKDAY_NAMES[WEEKDAYS[(WEEKDAYS.indexOf(day) + 6) % 7]!]}, running on into ${WEEKDAY_NAMES[day]}`;
                    const label = `Window ${p.index + 1}: ${opened}, ${describeTimes(w)}, ${windowSetting(w, unit)}${faulty.has(p.index) ? ", has a problem" : ""}`;
                    const tone = WINDOW_TONES[w.mode];
                    return (
                      <button
                        key={`${p.index}-${day}-${p.from}`}
                        type="button"
                        data-window={p.index}
                        data-opens={p.opensHere ? "" : undefined}
                        aria-keyshortcuts={canEdit ? "ArrowUp ArrowDown ArrowLeft ArrowRight Shift+ArrowUp Shift+ArrowDown Enter Delete" : undefined}
                        onKeyDown={(e) => onKeyDown(e, p.index, p.day)}
                        onPointerDown={(e) => startDrag(e, p.index, "move")}
                        onPointerMove={onPointerMove}
                        onPointerUp={endDrag}
                        onPointerCancel={() => setDrag(null)}
                        // A press is handled on release (endDrag), Enter on key down: the click only must not reach the column.
                        onClick={(e) => e.stopPropagation()}
                        className={`absolute inset-x-0.5 flex flex-col justify-start overflow-hidden border-l-4 px-1 pt-0.5 text-left text-xs leading-tight touch-none select-none ${tone} ${
                          p.opensHere ? "rounded-t-md" : "border-t border-t-dashed"
                        } ${p.closesHere ? "rounded-b-md" : ""} ${faulty.has(p.index) ? "ring-2 ring-ember-600" : ""} ${
                          drag?.index === p.index ? "opacity-80 shadow-lg" : ""
                        } ${canEdit ? "cursor-grab" : "cursor-default"}`}
                        // A gap above each opening, so that windows which touch are told apart.
                        style={{ top: p.from * PX_PER_MIN + (p.opensHere ? 2 : 0), height: Math.max(14, (p.until - p.from) * PX_PER_MIN - (p.opensHere ? 2 : 0)) }}
                      >
                        {/* Named by its whole description; the short visible text is for the eye. */}
                        <span className="sr-only">{label}</span>
                        {p.opensHere || p.from === 0 ? (
                          <span aria-hidden className="block font-semibold">
                            {windowSetting(w, unit)}
                          </span>
                        ) : null}
                        {p.opensHere && p.until - p.from >= 60 ? (
                          <span aria-hidden className="block">
                            {describeTimes(w).replace(" next day", "")}
                          </span>
                        ) : null}
                        {canEdit && p.closesHere ? (
                          <span
                            aria-hidden
                            onPointerDown={(e) => startDrag(e, p.index, "resize")}
                            className="absolute inset-x-0 bottom-0 h-3 cursor-ns-resize bg-current/20"
                          />
                        ) : null}
                      </button>
                    );
                  })}
              </div>
            ))}
          </div>
        </div>
      </div>
    </div>
  );
}
