"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { HeaterSafetyNote } from "@/components/safety/HeaterSafetyNote";
import { Field } from "@/components/ui/Field";
import { Select } from "@/components/ui/Select";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { APPLIANCE_KINDS, APPLIANCE_KIND_LABELS, FAILSAFE_MODES, FAILSAFE_MODE_LABELS } from "@/lib/domain";
import { plugSchemaFor, type Mains, type PlugFormInput, type PlugInput } from "@/lib/schemas/plug";
import { FormShell } from "./FormShell";
import { LoadCheck } from "./LoadCheck";
import { DeviceIdentityFields } from "./DeviceIdentityFields";
import { NumberField } from "./NumberField";

const FIELDS = [
  "name",
  "deviceId",
  "houseId",
  "applianceKind",
  "applianceWatts",
  "ratedCurrentA",
  "metersEnergy",
  "sensorId",
  "failsafe",
  "failsafeDutyPercent",
  "failsafeDutyPeriodS",
  "staleAfterS",
  "minOnS",
  "minOffS",
  "leaseS",
] as const;
type FieldName = (typeof FIELDS)[number];

export type StoredPlug = PlugInput & { id: string };
type Option = { id: string; name: string };
type PlugFormProps = {
  siteId: string;
  slug: string;
  mains: Mains;
  houses: Option[];
  sensors: (Option & { houseId: string })[];
  /** A plug to change; without it the form adds one. */
  plug?: StoredPlug;
  houseId?: string;
};

const minutes = (s: number) => (s >= 60 && s % 60 === 0 ? `${s / 60} min` : `${s} s`);

/** A plug and its appliance, with the continuous-load check as the watts and rating are typed. */
export function PlugForm({ siteId, slug, mains, houses, sensors, plug, houseId }: PlugFormProps) {
  const router = useRouter();
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  // The handler's rule in the form too: the load must be within the site's continuous-load margin.
  const [schema] = useState(() => plugSchemaFor(mains));
  const {
    register,
    handleSubmit,
    setError,
    control,
    getValues,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<PlugFormInput, unknown, PlugInput>({
    resolver: zodResolver(schema),
    defaultValues: plug ?? {
      name: "",
      deviceId: "",
      houseId: houseId ?? houses[0]?.id ?? "",
      applianceKind: "heater",
      metersEnergy: false,
      sensorId: sensors.find((s) => s.houseId === (houseId ?? houses[0]?.id))?.id ?? null,
      failsafe: "off",
      failsafeDutyPercent: null,
      failsafeDutyPeriodS: 1200,
      staleAfterS: 600,
      minOnS: 180,
      minOffS: 180,
      leaseS: 900,
    },
  });
  const [watts, rating, chosenHouse, failsafe, kind] = useWatch({ control, name: ["applianceWatts", "ratedCurrentA", "houseId", "failsafe", "applianceKind"] });
  const houseSensors = sensors.filter((s) => s.houseId === chosenHouse);

  // A plug's sensor must be in its house: moving the plug offers that house's first sensor.
  useEffect(() => {
    const current = getValues("sensorId");
    const inHouse = sensors.filter((s) => s.houseId === chosenHouse);
    if (current && inHouse.some((s) => s.id === current)) return;
    setValue("sensorId", inHouse[0]?.id ?? null);
  }, [chosenHouse, sensors, getValues, setValue]);

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const body = { ...values, failsafeDutyPercent: values.failsafe === "duty" ? values.failsafeDutyPercent : null };
    const result = plug
      ? await sendJson<{ plug: StoredPlug }>(`/api/sites/${siteId}/plugs/${plug.id}`, "PATCH", { ...body, deviceId: undefined })
      : await sendJson<{ plug: StoredPlug }>(`/api/sites/${siteId}/plugs`, "POST", body);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as FieldName, { message })));
      return;
    }
    if (plug) {
      setSaved(true);
      router.refresh();
    } else {
      router.push(`/sites/${slug}/devices/plug/${result.data.plug.id}?added=1`);
    }
  });

  const number = (name: FieldName) => register(name, { valueAsNumber: true });
  // An empty choice is "no sensor" (null), not an empty id.
  const sensorField = register("sensorId", { setValueAs: (v: string | null) => (v ? v : null) });
  const dutyField = register("failsafeDutyPercent", { setValueAs: (v: string | number | null) => (v === "" || v === null ? null : Number(v)) });

  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel={plug ? "Save the plug" : "Add the plug"} pendingLabel="Saving…">
      {saved ? <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">Saved.</p> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <DeviceIdentityFields
          fields={{ name: register("name"), deviceId: register("deviceId"), houseId: register("houseId") }}
          errors={errors}
          houses={houses}
          added={Boolean(plug)}
          nameExample="Glasshouse heater"
          idExample="glass-heater"
          topics="topics"
        />
        <Field label="Sensor its bands follow" hint="A sensor in the same house. Without one, only plain on/off windows work." error={errors.sensorId?.message}>
          {(c) => (
            <Select {...c} {...sensorField}>
              <option value="">No sensor</option>
              {houseSensors.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>

      <fieldset className="flex flex-col gap-4 rounded-lg border border-frost-200 p-4">
        <legend className="px-1 text-sm font-semibold text-frost-900">Appliance and load</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <Field label="Appliance" error={errors.applianceKind?.message}>
            {(c) => (
              <Select {...c} {...register("applianceKind")}>
                {APPLIANCE_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {APPLIANCE_KIND_LABELS[k]}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <NumberField label="Rated power" unit="W" hint="From the appliance’s label." step={1} error={errors.applianceWatts?.message} register={number("applianceWatts")} />
          <NumberField label="Plug rating" unit="A" hint="From the plug or socket, e.g. 13 A, 16 A, 15 A." step={0.1} error={errors.ratedCurrentA?.message} register={number("ratedCurrentA")} />
        </div>
        <LoadCheck watts={Number(watts)} ratedCurrentA={Number(rating)} {...mains} />
        <HeaterSafetyNote open={kind === "heater"} continuousLoadPercent={mains.continuousLoadPercent} />
        <label className="flex min-h-11 items-center gap-3 text-sm text-frost-900">
          <input type="checkbox" className="size-5 accent-leaf-700" {...register("metersEnergy")} />
          The plug measures the energy it passes (watts and watt-hours in its reports)
        </label>
      </fieldset>

      <fieldset className="flex flex-col gap-4 rounded-lg border border-frost-200 p-4">
        <legend className="px-1 text-sm font-semibold text-frost-900">When the sensor goes quiet</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <Field label="Fail-safe" error={errors.failsafe?.message}>
            {(c) => (
              <Select {...c} {...register("failsafe")}>
                {FAILSAFE_MODES.map((m) => (
                  <option key={m} value={m}>
                    {FAILSAFE_MODE_LABELS[m]}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <NumberField label="Quiet after" unit="s" hint="A reading older than this is stale (600 s = 10 min)." step={1} error={errors.staleAfterS?.message} register={number("staleAfterS")} />
        </div>
        {failsafe === "duty" ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <NumberField label="On for" unit="% of each period" step={1} error={errors.failsafeDutyPercent?.message} register={dutyField} />
            <NumberField label="Duty period" unit="s" hint="1200 s = 20 min." step={1} error={errors.failsafeDutyPeriodS?.message} register={number("failsafeDutyPeriodS")} />
          </div>
        ) : null}
      </fieldset>

      <fieldset className="grid gap-4 rounded-lg border border-frost-200 p-4 sm:grid-cols-3">
        <legend className="px-1 text-sm font-semibold text-frost-900">Switching</legend>
        <NumberField label="Least time on" unit="s" hint={`Before it may switch off again (default ${minutes(180)}).`} step={1} error={errors.minOnS?.message} register={number("minOnS")} />
        <NumberField label="Least time off" unit="s" hint={`Before it may switch on again (default ${minutes(180)}).`} step={1} error={errors.minOffS?.message} register={number("minOffS")} />
        <NumberField label="Lease" unit="s" hint={`A command holds this long; then the plug falls back on its own (default ${minutes(900)}).`} step={1} error={errors.leaseS?.message} register={number("leaseS")} />
      </fieldset>
    </FormShell>
  );
}
