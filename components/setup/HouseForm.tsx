"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Field } from "@/components/ui/Field";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { GLAZINGS, GLAZING_LABELS, HOUSE_KINDS, HOUSE_KIND_LABELS } from "@/lib/domain";
import { houseSchema, type HouseFormInput, type HouseInput } from "@/lib/schemas/house";
import { unitSymbol } from "@/lib/units";
import { FormShell } from "./FormShell";
import { NumberField } from "./NumberField";
import { inUnit, withCelsius } from "./with-celsius";

const FIELDS = ["name", "kind", "lengthM", "widthM", "eaveHeightM", "ridgeHeightM", "glazing", "airChangesPerHour", "lowLimitC", "highLimitC", "notes"] as const;

type Stored = Omit<HouseInput, "notes"> & { id: string; notes: string | null };
type HouseFormProps = { siteId: string; slug: string; house?: Stored };

/** A new house, or a change to one; temperatures typed in the person's unit and sent in °C. */
export function HouseForm({ siteId, slug, house }: HouseFormProps) {
  const router = useRouter();
  const unit = useTemperatureUnit();
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<HouseFormInput, unknown, HouseInput>({
    resolver: withCelsius(zodResolver(houseSchema), unit, ["lowLimitC", "highLimitC"]),
    defaultValues: house
      ? { ...house, notes: house.notes ?? "", lowLimitC: inUnit(house.lowLimitC, unit), highLimitC: inUnit(house.highLimitC, unit) }
      : { name: "", kind: "glasshouse", glazing: "single_glass", airChangesPerHour: 1, lowLimitC: inUnit(2, unit), highLimitC: inUnit(35, unit), notes: "" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = house
      ? await sendJson<{ house: Stored }>(`/api/sites/${siteId}/houses/${house.id}`, "PATCH", values)
      : await sendJson<{ house: Stored }>(`/api/sites/${siteId}/houses`, "POST", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message })));
      return;
    }
    if (house) {
      setSaved(true);
      router.refresh();
    } else {
      router.push(`/sites/${slug}/houses/${result.data.house.id}?added=1`);
    }
  });

  const t = unitSymbol(unit);
  const number = (name: (typeof FIELDS)[number]) => register(name, { valueAsNumber: true });
  return (
    <FormShell
      onSubmit={onSubmit}
      error={serverError}
      pending={isSubmitting}
      submitLabel={house ? "Save the house" : "Add the house"}
      pendingLabel="Saving…"
    >
      {saved ? <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">Saved.</p> : null}
      <Field label="Name" hint="What you call it, e.g. “Long glasshouse”." error={errors.name?.message}>
        {(control) => <TextInput {...control} {...register("name")} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Kind" error={errors.kind?.message}>
          {(control) => (
            <Select {...control} {...register("kind")}>
              {HOUSE_KINDS.map((k) => (
                <option key={k} value={k}>
                  {HOUSE_KIND_LABELS[k]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Glazing" error={errors.glazing?.message}>
          {(control) => (
            <Select {...control} {...register("glazing")}>
              {GLAZINGS.map((g) => (
                <option key={g} value={g}>
                  {GLAZING_LABELS[g]}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-frost-900">Size</legend>
        <NumberField label="Length" unit="m" error={errors.lengthM?.message} register={number("lengthM")} />
        <NumberField label="Width" unit="m" error={errors.widthM?.message} register={number("widthM")} />
        <NumberField label="Eave height" unit="m" hint="Polytunnels: the height at the hoops’ shoulders." error={errors.eaveHeightM?.message} register={number("eaveHeightM")} />
        <NumberField label="Ridge height" unit="m" error={errors.ridgeHeightM?.message} register={number("ridgeHeightM")} />
        <NumberField
          label="Air changes per hour"
          hint="Leakage with doors and vents shut: about 1 for a typical house, less for a tight one."
          error={errors.airChangesPerHour?.message}
          register={number("airChangesPerHour")}
        />
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-frost-900">Safety limits</legend>
        <NumberField
          label="Low limit (frost)"
          unit={t}
          hint="Bands may not reach below it; colder than this raises the too-cold alarm."
          error={errors.lowLimitC?.message}
          register={number("lowLimitC")}
        />
        <NumberField
          label="High limit (cut-out)"
          unit={t}
          hint="Heaters are switched off at or above it, whatever else is asked."
          error={errors.highLimitC?.message}
          register={number("highLimitC")}
        />
      </fieldset>
      <Field label="Notes" error={errors.notes?.message}>
        {(control) => <textarea {...control} rows={3} className="block w-full rounded-lg border border-frost-300 px-3 py-2 text-base sm:text-sm" {...register("notes")} />}
      </Field>
    </FormShell>
  );
}
