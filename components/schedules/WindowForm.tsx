"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useMemo, useRef } from "react";
import { useForm, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { WINDOW_MODE_LABELS, WINDOW_MODES } from "@/lib/domain";
import { windowFormSchema, windowFormTimes, type WindowFormValues, type WindowInput } from "@/lib/schemas/schedule";
import { WEEKDAYS, WEEKDAY_NAMES, WEEKDAY_SHORT, durationBetween, formatDuration } from "@/lib/schedules/week";
import { toUnit, unitSymbol } from "@/lib/units";

type Props = {
  title: string;
  initial: Omit<WindowInput, "id">;
  /** Messages for this window from the plan's checks or the server, by the window's field (lowC, highC, days, …). */
  errors?: Record<string, string>;
  onSubmit: (window: Omit<WindowInput, "id">) => void;
  onCancel: () => void;
};

const round1 = (n: number) => Math.round(n * 10) / 10;

/** Adds or edits one window: its days, start and end, and its band or on/off. */
export function WindowForm({ title, initial, errors = {}, onSubmit, onCancel }: Props) {
  const unit = useTemperatureUnit();
  const schema = useMemo(() => windowFormSchema(unit), [unit]);
  const heading = useRef<HTMLHeadingElement>(null);
  const defaults: WindowFormValues = {
    days: initial.days,
    ...windowFormTimes(initial),
    mode: initial.mode,
    low: initial.lowC === null ? null : round1(toUnit(initial.lowC, unit)),
    high: initial.highC === null ? null : round1(toUnit(initial.highC, unit)),
  };
  const {
    register,
    handleSubmit,
    control: formControl,
    formState: { errors: formErrors },
  } = useForm<WindowFormValues, unknown, Omit<WindowInput, "id">>({ resolver: zodResolver(schema), defaultValues: defaults });

  useEffect(() => heading.current?.focus(), []);

  const [mode, start, end, extraDays] = useWatch({ control: formControl, name: ["mode", "start", "end", "extraDays"] });
  const length = /^\d\d:\d\d$/.test(start ?? "") && /^\d\d:\d\d$/.test(end ?? "") ? durationBetween(start, end, Number(extraDays) || 0) : null;
  const edge = (c: number | null) => (c === null || Number.isNaN(c) ? null : c);
  const asNumber = { setValueAs: (v: unknown) => (v === "" || v === null || v === undefined ? null : edge(Number(v))) };
  const err = (form: string | undefined, server: string | undefined) => form ?? server;

  return (
    <form
      onSubmit={handleSubmit(onSubmit)}
      onKeyDown={(e) => e.key === "Escape" && onCancel()}
      className="flex flex-col gap-4 rounded-card border border-leaf-300 bg-white p-4 shadow-md"
      aria-labelledby="window-form-title"
      noValidate
    >
      <h3 id="window-form-title" ref={heading} tabIndex={-1} className="text-lg font-semibold text-frost-950">
        {title}
      </h3>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-medium text-frost-900">Days</legend>
        <div className="flex flex-wrap gap-2">
          {WEEKDAYS.map((d) => (
            <label
              key={d}
              className="flex min-h-11 min-w-14 cursor-pointer items-center justify-center gap-1.5 rounded-lg border border-frost-300 px-3 text-sm has-checked:border-leaf-700 has-checked:bg-leaf-50 has-checked:font-semibold"
            >
              <input type="checkbox" value={d} {...register("days")} className="size-4 accent-leaf-700" aria-label={WEEKDAY_NAMES[d]} />
              <span aria-hidden>{WEEKDAY_SHORT[d]}</span>
            </label>
          ))}
        </div>
        {err(formErrors.days?.message, errors.days) ? <p className="text-sm text-ember-700">{err(formErrors.days?.message, errors.days)}</p> : null}
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Starts at" error={err(formErrors.start?.message, errors.start)}>
          {(control) => <TextInput type="time" step={60} {...control} {...register("start")} />}
        </Field>
        <Field
          label="Ends at"
          hint={length === null ? "At or before the start: the next day" : `Lasts ${formatDuration(length)}`}
          error={err(formErrors.end?.message, errors.durationMin)}
        >
          {(control) => <TextInput type="time" step={60} {...control} {...register("end")} />}
        </Field>
        <Field label="Runs on for" error={formErrors.extraDays?.message}>
          {(control) => (
            <Select {...control} {...register("extraDays", { valueAsNumber: true })}>
              <option value={0}>No extra days</option>
              {[1, 2, 3, 4, 5, 6].map((n) => (
                <option key={n} value={n}>
                  {n} more {n === 1 ? "day" : "days"}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="During the window" error={err(formErrors.mode?.message, errors.mode)}>
        {(control) => (
          <Select {...control} {...register("mode")}>
            {WINDOW_MODES.map((m) => (
              <option key={m} value={m}>
                {m === "band" ? "Keep a temperature band" : `${WINDOW_MODE_LABELS[m]} the whole time`}
              </option>
            ))}
          </Select>
        )}
      </Field>
      {mode === "band" ? (
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label={`Low edge (${unitSymbol(unit)})`} hint="Heat comes on at or below it" error={err(formErrors.low?.message, errors.lowC)}>
            {(control) => <TextInput type="number" inputMode="decimal" step={0.1} {...control} {...register("low", asNumber)} />}
          </Field>
          <Field label={`High edge (${unitSymbol(unit)})`} hint="Heat goes off at or above it" error={err(formErrors.high?.message, errors.highC)}>
            {(control) => <TextInput type="number" inputMode="decimal" step={0.1} {...control} {...register("high", asNumber)} />}
          </Field>
        </div>
      ) : null}
      <div className="flex flex-wrap gap-3">
        <Button type="submit">Keep this window</Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
