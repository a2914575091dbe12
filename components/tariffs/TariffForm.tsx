"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useFieldArray, useForm, useWatch, type FieldErrors } from "react-hook-form";
import { NumberField } from "@/components/setup/NumberField";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { TARIFF_KIND_LABELS, TARIFF_KINDS } from "@/lib/domain";
import { tariffSchema, type TariffInput } from "@/lib/schemas/tariff";
import { currencySymbol } from "@/lib/tariffs/money";
import { coverageProblems, tariffWeek } from "@/lib/tariffs/week";
import { WEEKDAYS, WEEKDAY_NAMES, WEEKDAY_SHORT } from "@/lib/schedules/week";
import { TariffWeek } from "./TariffWeek";

const EVERY_DAY = [...WEEKDAYS];
const ALL_DAY_RATE = { label: "All day", startsAt: "00:00", endsAt: "00:00", days: EVERY_DAY };
const FIELDS = ["name", "kind", "validFrom", "validUntil", "standingChargePerDay", "taxPercent", "rates"] as const;

export const blankTariff = (validFrom: string): TariffInput => ({
  name: "",
  kind: "flat",
  validFrom,
  validUntil: null,
  standingChargePerDay: NaN,
  taxPercent: 0,
  rates: [{ ...ALL_DAY_RATE, pricePerKwh: NaN }],
});

type Props = {
  siteId: string;
  currency: string;
  /** The tariff being changed; absent for a new one. */
  tariffId?: string;
  initial: TariffInput;
  onSaved: (notice: string) => void;
  onCancel: () => void;
};


function rateError(errors: FieldErrors<TariffInput>): string | undefined {
  const rates = errors.rates as { message?: string; root?: { message?: string } } | undefined;
  return rates?.root?.message ?? rates?.message;
}

/** The owner's tariff editor: a flat rate or rates by weekday and time, checked to cover the week once. */
export function TariffForm({ siteId, currency, tariffId, initial, onSaved, onCancel }: Props) {
  // The form is long on a phone: a refusal is also said beside the button that was pressed.
  const [refusal, setRefusal] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    setValue,
    getValues,
    formState: { errors, isSubmitting },
  } = useForm<TariffInput>({ resolver: zodResolver(tariffSchema), defaultValues: initial });
  const { fields, append, remove, replace } = useFieldArray({ control, name: "rates" });
  const kind = useWatch({ control, name: "kind" });
  const rates = useWatch({ control, name: "rates" }) ?? [];
  const labels = rates.map((r, i) => r.label?.trim() || `Rate ${i + 1}`);
  // While the owner types: the week as the reports read it, same stretches on several days told once.
  const problems = kind === "time_of_use" ? coverageProblems(tariffWeek(kind, rates), labels) : [];

  function chooseKind(next: TariffInput["kind"]) {
    setValue("kind", next);
    if (next === "flat") {
      const first = getValues("rates")[0];
      replace([{ ...ALL_DAY_RATE, pricePerKwh: first?.pricePerKwh ?? NaN }]);
    }
  }

  const onSubmit = handleSubmit(async (values) => {
    setRefusal(null);
    const result = await sendJson<{ reportsUpdated: boolean }>(tariffId ? `/api/sites/${siteId}/tariffs/${tariffId}` : `/api/sites/${siteId}/tariffs`, tariffId ? "PUT" : "POST", values);
    if (!result.ok) {
      placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message }));
      setRefusal(result.error.message);
      return;
    }
    onSaved(
      result.data.reportsUpdated
        ? `Saved “${values.name}”. Reports now cost its dates with it.`
        : `Saved “${values.name}”, but the reports could not be brought up to date just now; they will be after the next rebuild.`,
    );
  });

  const unit = currencySymbol(currency);
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5" aria-label={tariffId ? "Change tariff" : "New tariff"}>
      <Field label="Name" hint="As your supplier calls it, e.g. “Economy two-rate 2026”." error={errors.name?.message}>
        {(c) => <TextInput {...c} {...register("name")} autoComplete="off" />}
      </Field>

      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-medium text-frost-900">Kind</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {TARIFF_KINDS.map((k) => (
            <label key={k} className="flex min-h-11 cursor-pointer items-center gap-3 rounded-lg border border-frost-300 bg-white px-3 has-[:checked]:border-leaf-600 has-[:checked]:bg-leaf-50">
              <input type="radio" name="tariff-kind" value={k} checked={kind === k} onChange={() => chooseKind(k)} className="size-5 accent-leaf-700" />
              <span className="text-sm text-frost-900">
                <span className="font-medium">{TARIFF_KIND_LABELS[k]}</span>
                <span className="block text-xs text-frost-600">{k === "flat" ? "One price for every kWh" : "Prices by time of day and weekday"}</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>

      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Valid from" error={errors.validFrom?.message}>
          {(c) => <TextInput {...c} type="date" {...register("validFrom")} />}
        </Field>
        <Field label="Valid until (optional)" hint="The last day it applies. Leave empty while it is your current tariff." error={errors.validUntil?.message}>
          {(c) => <TextInput {...c} type="date" {...register("validUntil", { setValueAs: (v: string | null) => (v ? v : null) })} />}
        </Field>
        <NumberField
          label="Standing charge per day"
          unit={unit}
          hint="Before tax, as on the bill."
          step="any"
          error={errors.standingChargePerDay?.message}
          register={register("standingChargePerDay", { valueAsNumber: true })}
        />
        <NumberField label="Tax" unit="%" hint="VAT or sales tax added to energy and standing charge; 0 if prices include it." error={errors.taxPercent?.message} register={register("taxPercent", { valueAsNumber: true })} />
      </div>

      <fieldset className="flex flex-col gap-3">
        <legend className="text-sm font-medium text-frost-900">{kind === "flat" ? "Unit price" : "Unit rates"}</legend>
        {kind === "time_of_use" ? (
          <p className="text-xs text-frost-600">
            Each rate runs from its start to its end on the ticked days; an end at or before the start runs past midnight into the next morning. Together they must cover every hour of the week once.
          </p>
        ) : null}
        {fields.map((field, i) => {
          const e = errors.rates?.[i];
          if (kind === "flat") {
            return (
              <NumberField key={field.id} label="Price per kWh" unit={unit} hint="Before tax." error={e?.pricePerKwh?.message} register={register(`rates.${i}.pricePerKwh`, { valueAsNumber: true })} />
            );
          }
          return (
            <div key={field.id} className="flex flex-col gap-3 rounded-lg border border-frost-200 bg-frost-50 p-3">
              <div className="grid gap-3 sm:grid-cols-[2fr_1fr_1fr_1.5fr]">
                <Field label={`Rate ${i + 1} name`} error={e?.label?.message}>
                  {(c) => <TextInput {...c} placeholder="e.g. Night" {...register(`rates.${i}.label`)} />}
                </Field>
                <Field label="Starts" error={e?.startsAt?.message}>
                  {(c) => <TextInput {...c} type="time" {...register(`rates.${i}.startsAt`)} />}
                </Field>
                <Field label="Ends" error={e?.endsAt?.message}>
                  {(c) => <TextInput {...c} type="time" {...register(`rates.${i}.endsAt`)} />}
                </Field>
                <NumberField label="Price per kWh" unit={unit} error={e?.pricePerKwh?.message} register={register(`rates.${i}.pricePerKwh`, { valueAsNumber: true })} />
              </div>
              <fieldset>
                <legend className="mb-1 text-xs font-medium text-frost-800">Days it starts on</legend>
                <div className="flex flex-wrap gap-1.5">
                  {WEEKDAYS.map((d) => (
                    <label
                      key={d}
                      className="flex min-h-11 min-w-12 cursor-pointer items-center justify-center gap-1.5 rounded-lg border border-frost-300 bg-white px-2 text-sm has-[:checked]:border-leaf-700 has-[:checked]:bg-leaf-100 has-[:checked]:font-semibold"
                    >
                      <input type="checkbox" value={d} aria-label={WEEKDAY_NAMES[d]} className="size-4 accent-leaf-700" {...register(`rates.${i}.days`)} />
                      <span aria-hidden="true">{WEEKDAY_SHORT[d]}</span>
                    </label>
                  ))}
                </div>
                {e?.days?.message ? <p className="mt-1 text-sm text-ember-700">{e.days.message}</p> : null}
              </fieldset>
              {fields.length > 1 ? (
                <Button variant="quiet" className="self-start text-ember-800" onClick={() => remove(i)}>
                  Remove rate {rates[i]?.label ? `“${rates[i]!.label}”` : i + 1}
                </Button>
              ) : null}
            </div>
          );
        })}
        {kind === "time_of_use" ? (
          <Button variant="secondary" className="self-start" onClick={() => append({ label: "", startsAt: "", endsAt: "", days: EVERY_DAY, pricePerKwh: NaN })}>
            Add a rate
          </Button>
        ) : null}
        {rateError(errors) && problems.length === 0 ? <p className="text-sm text-ember-700">{rateError(errors)}</p> : null}
      </fieldset>

      {kind === "time_of_use" ? (
        <section aria-labelledby="tariff-week-heading" className="flex flex-col gap-2">
          <h3 id="tariff-week-heading" className="text-sm font-medium text-frost-900">
            The week under these rates
          </h3>
          <TariffWeek kind={kind} rates={rates} />
          {problems.length ? (
            <Notice tone="caution">
              <p className="font-medium">Not yet covering the week once:</p>
              <ul className="mt-1 list-disc pl-5">
                {problems.slice(0, 8).map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
              {problems.length > 8 ? <p className="mt-1">…and {problems.length - 8} more.</p> : null}
            </Notice>
          ) : (
            <p className="text-sm text-leaf-800">Every hour of the week has one rate.</p>
          )}
        </section>
      ) : null}

      {refusal ? (
        <p role="alert" className="text-sm font-medium text-ember-700">
          Not saved: {refusal}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
          {tariffId ? "Save tariff" : "Add tariff"}
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
