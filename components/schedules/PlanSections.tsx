"use client";

import { useState } from "react";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { OUTSIDE_WINDOW_MODES, OUTSIDE_WINDOW_MODE_LABELS, type OutsideWindowMode } from "@/lib/domain";
import type { HouseLimits, PlanInput } from "@/lib/schemas/schedule";
import type { PlanAction } from "@/lib/schedules/edit";
import { formatTemperature, fromUnit, toUnit, unitSymbol } from "@/lib/units";

type SectionProps = { plan: PlanInput; errors: Record<string, string>; canEdit: boolean; dispatch: (action: PlanAction) => void };

const Section = ({ id, title, intro, children }: { id: string; title: string; intro: string; children: React.ReactNode }) => (
  <section aria-labelledby={id} className="flex flex-col gap-3 rounded-card border border-frost-200 bg-white p-4">
    <div>
      <h2 id={id} className="text-lg font-semibold text-frost-950">
        {title}
      </h2>
      <p className="text-sm text-frost-600">{intro}</p>
    </div>
    {children}
  </section>
);

/** A temperature typed in the person's unit, kept in °C; empty is null. */
function TemperatureInput({ label, hint, c, error, disabled, onChange }: { label: string; hint?: string; c: number | null; error?: string; disabled: boolean; onChange: (c: number | null) => void }) {
  const unit = useTemperatureUnit();
  const shown = c === null ? "" : String(Math.round(toUnit(c, unit) * 10) / 10);
  const [text, setText] = useState(shown);
  // Follow outside changes (a reset after saving) without fighting the person's typing.
  const [last, setLast] = useState(c);
  if (c !== last) {
    setLast(c);
    if (text === "" || fromUnit(Number(text), unit) !== c) setText(shown);
  }
  return (
    <Field label={`${label} (${unitSymbol(unit)})`} hint={hint} error={error}>
      {(control) => (
        <TextInput
          type="number"
          inputMode="decimal"
          step={0.1}
          disabled={disabled}
          value={text}
          onChange={(e) => {
            setText(e.target.value);
            const n = e.target.valueAsNumber;
            onChange(e.target.value === "" || Number.isNaN(n) ? null : fromUnit(n, unit));
          }}
          {...control}
        />
      )}
    </Field>
  );
}

export function OutsideSection({ plan, errors, canEdit, dispatch, limits }: SectionProps & { limits: HouseLimits }) {
  const unit = useTemperatureUnit();
  return (
    <Section
      id="outside-title"
      title="Outside the windows"
      intro={`When no window is open the plug is off, or keeps a frost-protection band. This house: frost limit ${formatTemperature(limits.lowLimitC, unit)}, safety cut-out ${formatTemperature(limits.highLimitC, unit)}.`}
    >
      <Field label="The plug is" error={errors.outsideWindows}>
        {(control) => (
          <Select
            {...control}
            disabled={!canEdit}
            value={plan.outsideWindows}
            onChange={(e) => {
              const mode = e.target.value as OutsideWindowMode;
              dispatch({
                type: "set",
                patch:
                  mode === "frost"
                    ? { outsideWindows: mode, frostLowC: plan.frostLowC ?? Math.max(limits.lowLimitC, 3), frostHighC: plan.frostHighC ?? Math.max(limits.lowLimitC, 3) + 2 }
                    : { outsideWindows: mode },
              });
            }}
          >
            {OUTSIDE_WINDOW_MODES.map((m) => (
              <option key={m} value={m}>
                {OUTSIDE_WINDOW_MODE_LABELS[m]}
              </option>
            ))}
          </Select>
        )}
      </Field>
      {plan.outsideWindows === "frost" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <TemperatureInput label="Frost low edge" hint="Heat comes on at or below it" c={plan.frostLowC} error={errors.frostLowC} disabled={!canEdit} onChange={(c) => dispatch({ type: "set", patch: { frostLowC: c } })} />
          <TemperatureInput label="Frost high edge" hint="Heat goes off at or above it" c={plan.frostHighC} error={errors.frostHighC} disabled={!canEdit} onChange={(c) => dispatch({ type: "set", patch: { frostHighC: c } })} />
        </div>
      ) : null}
    </Section>
  );
}

export function SeasonSection({ plan, errors, canEdit, dispatch }: SectionProps) {
  return (
    <Section id="season-title" title="Season" intro="The windows open only between these dates (both included). Leave a date empty for no limit.">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="From" error={errors.validFrom}>
          {(control) => <TextInput type="date" {...control} disabled={!canEdit} value={plan.validFrom ?? ""} onChange={(e) => dispatch({ type: "set", patch: { validFrom: e.target.value || null } })} />}
        </Field>
        <Field label="Until" error={errors.validUntil}>
          {(control) => <TextInput type="date" {...control} disabled={!canEdit} value={plan.validUntil ?? ""} onChange={(e) => dispatch({ type: "set", patch: { validUntil: e.target.value || null } })} />}
        </Field>
      </div>
    </Section>
  );
}

export function SkipDaysSection({ plan, errors, canEdit, dispatch }: SectionProps) {
  const [day, setDay] = useState("");
  const [note, setNote] = useState("");
  const add = () => {
    if (!day) return;
    dispatch({ type: "set", patch: { skipDays: [...plan.skipDays, { day, note: note.trim() || null }].sort((a, b) => (a.day < b.day ? -1 : 1)) } });
    setDay("");
    setNote("");
  };
  return (
    <Section id="skip-title" title="Skip days" intro="No window opens on these dates (a holiday, a day the house is empty); the outside-windows setting applies. A window that opened the day before runs to its end.">
      {plan.skipDays.length ? (
        <ul className="flex flex-col gap-2">
          {plan.skipDays.map((s, i) => (
            <li key={s.day} className="flex flex-wrap items-center gap-3 rounded-lg border border-frost-200 px-3 py-2">
              <span className="font-medium tabular-nums">{s.day}</span>
              <span className="flex-1 text-sm text-frost-700">{s.note}</span>
              {errors[`skipDays.${i}.day`] ? <span className="text-sm text-ember-700">{errors[`skipDays.${i}.day`]}</span> : null}
              {canEdit ? (
                <Button variant="quiet" aria-label={`Remove skip day ${s.day}`} onClick={() => dispatch({ type: "set", patch: { skipDays: plan.skipDays.filter((_, j) => j !== i) } })}>
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-frost-600">No skip days.</p>
      )}
      {errors.skipDays ? <p className="text-sm text-ember-700">{errors.skipDays}</p> : null}
      {canEdit ? (
        <div className="grid items-end gap-3 sm:grid-cols-[12rem_1fr_auto]">
          <Field label="Date">{(control) => <TextInput type="date" {...control} value={day} onChange={(e) => setDay(e.target.value)} />}</Field>
          <Field label="Note (optional)">{(control) => <TextInput {...control} maxLength={200} value={note} onChange={(e) => setNote(e.target.value)} />}</Field>
          <Button variant="secondary" onClick={add} disabled={!day}>
            Add skip day
          </Button>
        </div>
      ) : null}
    </Section>
  );
}
