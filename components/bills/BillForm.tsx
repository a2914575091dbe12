"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { NumberField } from "@/components/setup/NumberField";
import { Button } from "@/components/ui/Button";
import { Field } from "@/components/ui/Field";
import { Notice } from "@/components/ui/Notice";
import { TextInput } from "@/components/ui/TextInput";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { billSchema, type Bill, type BillInput } from "@/lib/schemas/bill";
import { currencySymbol } from "@/lib/tariffs/money";

const FIELDS = ["startsOn", "endsOn", "label", "billedKwh", "billedAmount"] as const;

type Props = {
  siteId: string;
  currency: string;
  /** The stored bill being given its figures or changed; absent for a new one. */
  billId?: string;
  initial: BillInput;
  onSaved: (message: string) => void;
  onCancel: () => void;
};

/** One bill's dates and what it says, as printed on it. */
export function BillForm({ siteId, currency, billId, initial, onSaved, onCancel }: Props) {
  const [serverError, setServerError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<BillInput, unknown, Bill>({ resolver: zodResolver(billSchema), defaultValues: initial });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    const result = await sendJson(billId ? `/api/sites/${siteId}/bills/${billId}` : `/api/sites/${siteId}/bills`, billId ? "PUT" : "POST", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message })));
      return;
    }
    onSaved(billId ? "Bill saved." : "Bill added.");
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="From" hint="The first day the bill covers." error={errors.startsOn?.message}>
          {(c) => <TextInput {...c} type="date" {...register("startsOn")} />}
        </Field>
        <Field label="To" hint="The last day it covers." error={errors.endsOn?.message}>
          {(c) => <TextInput {...c} type="date" {...register("endsOn")} />}
        </Field>
        <NumberField label="Electricity used" unit="kWh" hint="The bill’s total, all uses." error={errors.billedKwh?.message} register={register("billedKwh", { valueAsNumber: true })} />
        <NumberField
          label="Amount"
          unit={currencySymbol(currency)}
          hint="The total to pay, tax included."
          error={errors.billedAmount?.message}
          register={register("billedAmount", { valueAsNumber: true })}
        />
      </div>
      <Field label="Label (optional)" hint="e.g. “Winter quarter 2026”." error={errors.label?.message}>
        {(c) => <TextInput {...c} autoComplete="off" {...register("label", { setValueAs: (v: string | null) => (v ? v : null) })} />}
      </Field>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
          {billId ? "Save bill" : "Add bill"}
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={isSubmitting}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
