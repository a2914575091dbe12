"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { FormShell } from "@/components/setup/FormShell";
import { Field } from "@/components/ui/Field";
import { TextInput } from "@/components/ui/TextInput";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { summaryCovers } from "@/lib/alerts/summary-covers";
import { summaryTimeSchema, type SummaryTime } from "@/lib/schemas/alert-summary";

type Draft = { send: boolean; summaryTime: string };

const schemaResolver = zodResolver(summaryTimeSchema);
const resolver: Resolver<Draft, unknown, SummaryTime> = async (values, context, options) => {
  const result = await schemaResolver({ summaryTime: values.send ? values.summaryTime : null }, context, options as never);
  return Object.keys(result.errors).length ? { values: {}, errors: result.errors as never } : { values: result.values as SummaryTime, errors: {} };
};

/** The owner's choice of when the daily summary e-mail goes out, in the site's zone. */
export function SummaryTimeForm({ siteId, timeZone, summaryTime }: { siteId: string; timeZone: string; summaryTime: string | null }) {
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<Draft, unknown, SummaryTime>({ resolver, defaultValues: { send: summaryTime !== null, summaryTime: summaryTime ?? "07:00" } });
  const send = useWatch({ control, name: "send" });
  const time = useWatch({ control, name: "summaryTime" });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = await sendJson(`/api/sites/${siteId}/alerts/summary-time`, "PUT", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, ["summaryTime"], (_name, message) => setError("summaryTime", { message })));
      return;
    }
    setSaved(true);
  });

  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel="Save summary time" pendingLabel="Saving…">
      {saved ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">
          Saved.
        </p>
      ) : null}
      <label className="inline-flex min-h-11 cursor-pointer items-center gap-3 self-start text-sm font-medium text-frost-900">
        <input type="checkbox" className="size-6 accent-leaf-700" {...register("send")} />
        Send a daily summary
      </label>
      {send ? (
        <Field
          label="Send it at"
          hint={`In ${timeZone.replaceAll("_", " ")}. A time before noon covers yesterday; from noon on it covers the day so far${/^\d\d:\d\d$/.test(time ?? "") ? ` (at ${time}: ${summaryCovers(time)})` : ""}.`}
          error={errors.summaryTime?.message}
        >
          {(c) => <TextInput {...c} type="time" className="sm:max-w-40" {...register("summaryTime")} />}
        </Field>
      ) : (
        <p className="text-sm text-frost-600">No daily summary goes out.</p>
      )}
    </FormShell>
  );
}
