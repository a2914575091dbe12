"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { CurrencySelect } from "@/components/site/CurrencySelect";
import { TimeZoneSelect } from "@/components/site/TimeZoneSelect";
import { useBrowserTimeZones } from "@/components/site/use-browser-time-zone";
import { Field } from "@/components/ui/Field";
import { TextInput } from "@/components/ui/TextInput";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { CONTINUOUS_LOAD_PERCENT, DEGREE_DAY_METHODS, DEGREE_DAY_METHOD_LABELS } from "@/lib/domain";
import { Select } from "@/components/ui/Select";
import { siteChangeSchema, type SiteChange } from "@/lib/schemas/site";
import { FormShell } from "./FormShell";
import { NumberField } from "./NumberField";

const FIELDS = ["name", "timeZone", "currency", "mainsVoltage", "continuousLoadPercent", "degreeDayMethod"] as const;
type Settings = Required<SiteChange>;

/** The owner's settings of the site; a change to the zone, voltage or margin reaches the controller at once. */
export function SiteSettingsForm({ siteId, site }: { siteId: string; site: Settings }) {
  const router = useRouter();
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const zones = useBrowserTimeZones()?.zones ?? null;
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<SiteChange>({ resolver: zodResolver(siteChangeSchema), defaultValues: site });
  const timeZone = useWatch({ control, name: "timeZone" }) ?? site.timeZone;

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = await sendJson(`/api/sites/${siteId}`, "PATCH", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message })));
      return;
    }
    setSaved(true);
    router.refresh();
  });

  const { min, max } = CONTINUOUS_LOAD_PERCENT;
  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel="Save site settings" pendingLabel="Saving…">
      {saved ? <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">Saved.</p> : null}
      <Field label="Site name" error={errors.name?.message}>
        {(c) => <TextInput {...c} {...register("name")} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Time zone" hint="Schedules and reports follow the clock of this zone." error={errors.timeZone?.message}>
          {(c) => <TimeZoneSelect {...c} zones={zones} current={timeZone} {...register("timeZone")} />}
        </Field>
        <Field label="Currency" hint="Used for tariffs and running costs." error={errors.currency?.message}>
          {(c) => <CurrencySelect {...c} {...register("currency")} />}
        </Field>
        <NumberField
          label="Mains voltage"
          unit="V"
          hint="230 in the UK and most of Europe, 120 in North America."
          step={1}
          error={errors.mainsVoltage?.message}
          register={register("mainsVoltage", { valueAsNumber: true })}
        />
        <NumberField
          label="Continuous-load margin"
          unit="%"
          hint={`How much of a plug’s rating a load running for hours may draw (${min}–${max} %; 80 % is the common rule). Plugs whose appliance goes over it are kept off.`}
          step={1}
          error={errors.continuousLoadPercent?.message}
          register={register("continuousLoadPercent", { valueAsNumber: true })}
        />
      </div>
      <Field
        label="Degree-days"
        hint="How the degree-day report counts each day’s cold: the UK’s base 15.5 °C or the US base 65 °F. Pick the one your weather service and energy adviser use."
        error={errors.degreeDayMethod?.message}
      >
        {(c) => (
          <Select {...c} {...register("degreeDayMethod")}>
            {DEGREE_DAY_METHODS.map((m) => (
              <option key={m} value={m}>
                {DEGREE_DAY_METHOD_LABELS[m]}
              </option>
            ))}
          </Select>
        )}
      </Field>
    </FormShell>
  );
}
