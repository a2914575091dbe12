"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { DeviceIdentityFields } from "./DeviceIdentityFields";
import { sensorSchema, type SensorFormInput, type SensorInput } from "@/lib/schemas/sensor";
import { FormShell } from "./FormShell";
import { PlacementField } from "./PlacementField";

const FIELDS = ["name", "deviceId", "houseId", "placement"] as const;

type SensorFormProps = {
  siteId: string;
  slug: string;
  houses: { id: string; name: string }[];
  sensor?: SensorInput & { id: string };
  houseId?: string;
};

/** A temperature/humidity sensor in a house. */
export function SensorForm({ siteId, slug, houses, sensor, houseId }: SensorFormProps) {
  const router = useRouter();
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<SensorFormInput, unknown, SensorInput>({
    resolver: zodResolver(sensorSchema),
    defaultValues: sensor ?? { name: "", deviceId: "", houseId: houseId ?? houses[0]?.id ?? "", placement: "inside" },
  });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = sensor
      ? await sendJson<{ sensor: { id: string } }>(`/api/sites/${siteId}/sensors/${sensor.id}`, "PATCH", { name: values.name, houseId: values.houseId, placement: values.placement })
      : await sendJson<{ sensor: { id: string } }>(`/api/sites/${siteId}/sensors`, "POST", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message })));
      return;
    }
    if (sensor) {
      setSaved(true);
      router.refresh();
    } else {
      router.push(`/sites/${slug}/devices/sensor/${result.data.sensor.id}?added=1`);
    }
  });

  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel={sensor ? "Save the sensor" : "Add the sensor"} pendingLabel="Saving…">
      {saved ? <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">Saved.</p> : null}
      <DeviceIdentityFields
        fields={{ name: register("name"), deviceId: register("deviceId"), houseId: register("houseId") }}
        errors={errors}
        houses={houses}
        added={Boolean(sensor)}
        nameExample="Glasshouse air"
        idExample="glass-air"
        topics="topic"
      />
      <PlacementField register={register("placement")} error={errors.placement?.message} />
    </FormShell>
  );
}
