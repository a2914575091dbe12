"use client";

import Link from "next/link";
import { useEffect, useMemo, useReducer, useRef, useState } from "react";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import type { FieldErrors } from "@/lib/errors";
import { planLimitIssues, planSchema, windowLabel, type HouseLimits, type PlanInput, type WindowInput } from "@/lib/schemas/schedule";
import { planReducer } from "@/lib/schedules/edit";
import { describeWindow } from "@/lib/schedules/format";
import { WEEKDAYS, WEEKDAY_NAMES, timeOf, type Weekday } from "@/lib/schedules/week";
import { ApiError, sendJson } from "./api";
import { CopyDayForm } from "./CopyDayForm";
import { DayList } from "./DayList";
import { PlanPreview } from "./PlanPreview";
import { OutsideSection, SeasonSection, SkipDaysSection } from "./PlanSections";
import { WeekGrid } from "./WeekGrid";
import { WindowForm } from "./WindowForm";

export type EditorPlug = { id: string; name: string; houseName: string; applianceKind: string } & HouseLimits;

type Props = {
  siteId: string;
  siteSlug: string;
  timeZone: string;
  plug: EditorPlug;
  initial: PlanInput;
  scheduleCount: number;
  unreadable: number;
  canEdit: boolean;
};

type Editing = { index: number | null; initial: Omit<WindowInput, "id"> };

/** The field messages of a zod result, keyed like the server's AppError fields. */
function clientErrors(plan: PlanInput, limits: HouseLimits): FieldErrors {
  const parsed = planSchema.safeParse(plan);
  const fields: FieldErrors = {};
  if (!parsed.success) for (const issue of parsed.error.issues) fields[issue.path.join(".")] ??= issue.message;
  return { ...planLimitIssues(plan, limits), ...fields };
}

/** One window's messages by its own field ("" for the window as a whole). */
function errorsOfWindow(errors: FieldErrors, index: number): Record<string, string> {
  const prefix = `windows.${index}`;
  const out: Record<string, string> = {};
  for (const [key, message] of Object.entries(errors)) {
    if (key === prefix) out[""] = message;
    else if (key.startsWith(`${prefix}.`)) out[key.slice(prefix.length + 1)] = message;
  }
  return out;
}

export function ScheduleEditor({ siteId, siteSlug, timeZone, plug, initial, scheduleCount, unreadable, canEdit }: Props) {
  const unit = useTemperatureUnit();
  const [saved, setSaved] = useState(initial);
  const [plan, dispatchPlan] = useReducer(planReducer, initial);
  const [serverErrors, setServerErrors] = useState<FieldErrors>({});
  const [status, setStatus] = useState<{ tone: "info" | "error"; text: string } | null>(null);
  const [saving, setSaving] = useState(false);
  const [editing, setEditing] = useState<Editing | null>(null);
  const [copying, setCopying] = useState<Weekday | null>(null);
  const [announcement, setAnnouncement] = useState("");
  const summary = useRef<HTMLDivElement>(null);

  const dispatch: typeof dispatchPlan = (action) => {
    setServerErrors({});
    setStatus(null);
    dispatchPlan(action);
  };

  const limits: HouseLimits = { lowLimitC: plug.lowLimitC, highLimitC: plug.highLimitC };
  const local = useMemo(() => clientErrors(plan, limits), [plan, limits.lowLimitC, limits.highLimitC]); // eslint-disable-line react-hooks/exhaustive-deps
  const errors = { ...local, ...serverErrors };
  const faulty = new Set(plan.windows.map((_, i) => i).filter((i) => Object.keys(errorsOfWindow(errors, i)).length > 0));
  const dirty = JSON.stringify(plan) !== JSON.stringify(saved);
  const valid = Object.keys(local).length === 0;

  useEffect(() => {
    if (!dirty) return;
    const warn = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = "";
    };
    // Links inside the app change the page without unloading it: ask before leaving by one.
    const leave = (e: MouseEvent) => {
      const link = (e.target as Element | null)?.closest?.("a[href]");
      if (!link || link.getAttribute("target") === "_blank" || e.defaultPrevented) return;
      if (!window.confirm("This plan has unsaved changes. Leave without saving them?")) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", warn);
    document.addEventListener("click", leave, true);
    return () => {
      window.removeEventListener("beforeunload", warn);
      document.removeEventListener("click", leave, true);
    };
  }, [dirty]);

  const startAdd = (day: Weekday, startMin: number) => {
    setCopying(null);
    setEditing({ index: null, initial: { days: [day], start: timeOf(startMin), durationMin: 120, mode: "band", lowC: Math.max(plug.lowLimitC, 8), highC: Math.max(plug.lowLimitC, 8) + 2 } });
  };
  const startEdit = (index: number) => {
    const w = plan.windows[index];
    if (!w || !canEdit) return;
    setCopying(null);
    setEditing({ index, initial: w });
  };

  async function save() {
    if (!valid) {
      setStatus({ tone: "error", text: "The plan has problems, marked below. Fix them, then save." });
      summary.current?.focus();
      return;
    }
    setSaving(true);
    setStatus(null);
    try {
      const result = await sendJson<{ plan: PlanInput }>("PUT", `/api/sites/${siteId}/plugs/${plug.id}/schedule`, plan);
      setSaved(result.plan);
      dispatchPlan({ type: "reset", plan: result.plan });
      setServerErrors({});
      setStatus({ tone: "info", text: "Saved. The controller has been told and follows the new plan from now." });
    } catch (error) {
      const e = error as ApiError;
      setServerErrors(e.fields ?? {});
      setStatus({ tone: "error", text: e.message });
    } finally {
      setSaving(false);
    }
  }

  const windowProblems = plan.windows.flatMap((w, i) => Object.values(errorsOfWindow(errors, i)).map((message) => ({ i, w, message })));

  return (
    <div className="flex flex-col gap-6 pb-28">
      <div>
        <p className="text-sm">
          <Link href={`/sites/${siteSlug}/schedules`} className="text-leaf-800 underline underline-offset-2">
            All schedules
          </Link>
        </p>
        <h1 className="mt-1 text-2xl font-semibold text-frost-950">{plug.name}</h1>
        <p className="mt-1 text-sm text-frost-600">
          {plug.houseName} · Times are {timeZone}
        </p>
      </div>

      {!canEdit ? <Notice>Your role lets you see this schedule but not change it.</Notice> : null}
      {scheduleCount > 1 ? (
        <Notice tone="caution">
          This plug had {scheduleCount} separate schedules; they are shown here as one plan, with the first one’s name and season. Saving joins them into one.
        </Notice>
      ) : null}
      {unreadable > 0 ? (
        <Notice tone="caution">
          {unreadable} {unreadable === 1 ? "window has" : "windows have"} a repeat rule this editor cannot show, so saving here is refused to keep {unreadable === 1 ? "it" : "them"}.
        </Notice>
      ) : null}

      <section aria-labelledby="windows-title" className="flex flex-col gap-4 rounded-card border border-frost-200 bg-white p-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <div>
            <h2 id="windows-title" className="text-lg font-semibold text-frost-950">
              Time windows
            </h2>
            <p className="text-sm text-frost-600">
              Each window is a band (heat on at or below the low edge, off at or above the high edge) or plainly on or off. Windows may touch but not overlap.
            </p>
          </div>
          {canEdit ? (
            <div className="flex flex-wrap items-end gap-2">
              <Button onClick={() => startAdd("MO", 6 * 60)}>Add a window</Button>
              <label className="hidden flex-col gap-1 text-sm font-medium text-frost-900 sm:flex">
                Copy a day
                <Select
                  value=""
                  className="w-auto"
                  onChange={(e) => {
                    setEditing(null);
                    setCopying((e.target.value || null) as Weekday | null);
                  }}
                >
                  <option value="">Choose a day…</option>
                  {WEEKDAYS.map((d) => (
                    <option key={d} value={d}>
                      {WEEKDAY_NAMES[d]}
                    </option>
                  ))}
                </Select>
              </label>
            </div>
          ) : null}
        </div>

        {canEdit ? (
          <div className="max-w-md">
            <Field label="Plan name" error={errors.name}>
              {(control) => <TextInput {...control} maxLength={80} value={plan.name} onChange={(e) => dispatch({ type: "set", patch: { name: e.target.value } })} />}
            </Field>
          </div>
        ) : null}

        {windowProblems.length ? (
          <div ref={summary} tabIndex={-1} className="rounded-lg border border-ember-200 bg-ember-50 p-3 text-sm text-ember-800" role="alert">
            <p className="font-semibold">Problems with the windows</p>
            <ul className="mt-1 flex flex-col gap-1">
              {windowProblems.map(({ i, w, message }) => (
                <li key={`${i}-${message}`} className="flex flex-wrap items-center gap-2">
                  <span>
                    {windowLabel(w, i).replace(/^w/, "W")}: {message}
                  </span>
                  {canEdit ? (
                    <Button variant="quiet" className="min-h-9" onClick={() => startEdit(i)}>
                      Edit
                    </Button>
                  ) : null}
                </li>
              ))}
            </ul>
          </div>
        ) : null}

        {editing ? (
          <WindowForm
            key={editing.index ?? "new"}
            title={editing.index === null ? "New window" : `Window ${editing.index + 1}`}
            initial={editing.initial}
            errors={editing.index === null ? {} : errorsOfWindow(errors, editing.index)}
            onCancel={() => setEditing(null)}
            onSubmit={(w) => {
              if (editing.index === null) {
                dispatch({ type: "add", window: w });
                setAnnouncement(`Added ${describeWindow(w, unit)}`);
              } else {
                dispatch({ type: "update", index: editing.index, window: w });
                setAnnouncement(`Changed window ${editing.index + 1}: ${describeWindow(w, unit)}`);
              }
              setEditing(null);
            }}
          />
        ) : null}
        {copying ? (
          <CopyDayForm
            from={copying}
            onCancel={() => setCopying(null)}
            onCopy={(to) => {
              dispatch({ type: "copyDay", from: copying, to });
              setAnnouncement(`Copied ${WEEKDAY_NAMES[copying]} to ${to.map((d) => WEEKDAY_NAMES[d]).join(", ")}`);
              setCopying(null);
            }}
          />
        ) : null}

        <div className="hidden sm:block">
          <WeekGrid windows={plan.windows} faulty={faulty} canEdit={canEdit} dispatch={dispatch} onEdit={startEdit} onAdd={startAdd} announce={setAnnouncement} />
          {canEdit ? (
            <details className="mt-3 text-sm text-frost-700">
              <summary className="cursor-pointer font-medium">Using the grid</summary>
              <p className="mt-1">
                Click an empty hour to add a window there. Drag a window to move it, or its lower edge to change its length (15-minute steps). A window is
                the same on all its days: moving it moves every day. With the keyboard, tab to a window: arrow up and down move it 15 minutes, left and
                right move it a day, shift with up and down makes it shorter or longer, Enter edits it, Delete removes it.
              </p>
            </details>
          ) : null}
        </div>
        <div className="sm:hidden">
          <DayList
            windows={plan.windows}
            faulty={faulty}
            canEdit={canEdit}
            onEdit={startEdit}
            onAdd={startAdd}
            onCopy={(d) => {
              setEditing(null);
              setCopying(d);
            }}
            onRemove={(index, day) => {
              const w = plan.windows[index]!;
              dispatch({ type: "removeDay", index, day });
              setAnnouncement(`Removed ${describeWindow(w, unit)} from ${WEEKDAY_NAMES[day]}`);
            }}
          />
        </div>
        <p aria-live="polite" role="status" className="sr-only">
          {announcement}
        </p>
      </section>

      <OutsideSection plan={plan} errors={errors} canEdit={canEdit} dispatch={dispatch} limits={limits} />
      <SeasonSection plan={plan} errors={errors} canEdit={canEdit} dispatch={dispatch} />
      <SkipDaysSection plan={plan} errors={errors} canEdit={canEdit} dispatch={dispatch} />

      <PlanPreview siteId={siteId} plugId={plug.id} plan={plan} valid={valid} timeZone={timeZone} />

      {canEdit ? (
        <div className="fixed inset-x-0 bottom-0 z-10 border-t border-frost-200 bg-white/95 px-4 py-3 shadow-[0_-2px_8px_rgba(0,0,0,0.06)]">
          <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-3">
            <p className="min-w-0 flex-1 text-sm" role="status" aria-live="polite">
              {status ? <span className={status.tone === "error" ? "text-ember-700" : "text-leaf-800"}>{status.text}</span> : dirty ? <span className="font-medium text-soil-800">Unsaved changes</span> : <span className="text-frost-600">All changes saved</span>}
            </p>
            {dirty ? (
              <Button
                variant="secondary"
                onClick={() => {
                  if (window.confirm("Discard your unsaved changes to this plan?")) dispatch({ type: "reset", plan: saved });
                }}
              >
                Discard changes
              </Button>
            ) : null}
            <Button onClick={save} pending={saving} pendingLabel="Saving…" disabled={!dirty || unreadable > 0}>
              Save plan
            </Button>
          </div>
        </div>
      ) : null}
    </div>
  );
}
