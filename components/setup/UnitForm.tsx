"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { TEMPERATURE_UNITS, TEMPERATURE_UNIT_LABELS } from "@/lib/domain";
import { userSettingsSchema, type UserSettingsInput } from "@/lib/schemas/me";
import { FormShell } from "./FormShell";

const NAMES = { c: "Celsius", f: "Fahrenheit" } as const;

/** Each person's own °C/°F, the same in every site; the pages show the new unit once saved. */
export function UnitForm() {
  const router = useRouter();
  const unit = useTemperatureUnit();
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<UserSettingsInput>({ resolver: zodResolver(userSettingsSchema), defaultValues: { temperatureUnit: unit } });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = await sendJson("/api/me/settings", "PUT", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, ["temperatureUnit"], (_name, message) => setError("temperatureUnit", { message })));
      return;
    }
    setSaved(true);
    router.refresh();
  });

  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel="Save my settings" pendingLabel="Saving…">
      <fieldset aria-describedby={errors.temperatureUnit ? "unit-error" : undefined}>
        <legend className="mb-2 text-sm font-medium text-frost-900">Temperatures are shown and typed in</legend>
        <div className="flex flex-wrap gap-3">
          {TEMPERATURE_UNITS.map((u) => (
            <label
              key={u}
              className="flex min-h-11 min-w-36 cursor-pointer items-center gap-3 rounded-lg border border-frost-300 bg-white px-4 text-sm text-frost-900 has-[:checked]:border-leaf-600 has-[:checked]:bg-leaf-50"
            >
              <input type="radio" value={u} className="size-5 accent-leaf-700" {...register("temperatureUnit")} />
              {NAMES[u]} ({TEMPERATURE_UNIT_LABELS[u]})
            </label>
          ))}
        </div>
        {errors.temperatureUnit ? (
          <p id="unit-error" className="mt-2 text-sm text-ember-700">
            {errors.temperatureUnit.message}
          </p>
        ) : null}
      </fieldset>
      {saved ? <p role="status" className="text-sm text-leaf-800">Saved: temperatures now show in {TEMPERATURE_UNIT_LABELS[unit]}.</p> : null}
    </FormShell>
  );
}
