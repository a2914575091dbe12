"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm, type Resolver } from "react-hook-form";
import { FormShell } from "@/components/setup/FormShell";
import { Field } from "@/components/ui/Field";
import { TextInput } from "@/components/ui/TextInput";
import { alertPreferencesSchema, CHOOSABLE_ALERT_KINDS, type AlertPreferences } from "@/lib/alerts/preferences";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { ALERT_KIND_LABELS } from "@/lib/domain";
import { ALERT_KIND_MEANINGS } from "./kind-words";

type Draft = { kinds: string[]; quietFrom: string; quietUntil: string; dailySummary: boolean };

const FIELDS = ["kinds", "quietFrom", "quietUntil", "dailySummary"] as const;
const schemaResolver = zodResolver(alertPreferencesSchema);

/** Empty time boxes are "no quiet hours"; one box empty is caught by the schema. */
export function preferencesOf(draft: Draft): unknown {
  return {
    kinds: Array.isArray(draft.kinds) ? draft.kinds : draft.kinds ? [draft.kinds] : [],
    quietFrom: draft.quietFrom || null,
    quietUntil: draft.quietUntil || null,
    dailySummary: draft.dailySummary,
  };
}

const resolver: Resolver<Draft, unknown, AlertPreferences> = async (values, context, options) => {
  const result = await schemaResolver(preferencesOf(values) as never, context, options as never);
  return Object.keys(result.errors).length ? { values: {}, errors: result.errors as never } : { values: result.values as AlertPreferences, errors: {} };
};

type Props = {
  siteId: string;
  timeZone: string;
  preferences: AlertPreferences;
  /** false while the member has their role's defaults. */
  chosen: boolean;
  /** The site's summary time, or null when the owner has set none. */
  summaryTime: string | null;
};

/** A member's own alert e-mails for this site: which kinds, quiet hours, the daily summary. */
export function AlertPreferencesForm({ siteId, timeZone, preferences, chosen, summaryTime }: Props) {
  const [serverError, setServerError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<Draft, unknown, AlertPreferences>({
    resolver,
    defaultValues: { kinds: preferences.kinds, quietFrom: preferences.quietFrom ?? "", quietUntil: preferences.quietUntil ?? "", dailySummary: preferences.dailySummary },
  });

  const onSubmit = handleSubmit(async (values) => {
    setServerError(null);
    setSaved(false);
    const result = await sendJson(`/api/sites/${siteId}/alerts/preferences`, "PUT", values);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, FIELDS, (name, message) => setError(name as (typeof FIELDS)[number], { message })));
      return;
    }
    setSaved(true);
  });

  const zone = timeZone.replaceAll("_", " ");
  return (
    <FormShell onSubmit={onSubmit} error={serverError} pending={isSubmitting} submitLabel="Save my alert e-mails" pendingLabel="Saving…">
      {saved ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">
          Saved. New alerts reach you this way from now on.
        </p>
      ) : null}
      {!chosen ? <p className="text-sm text-frost-600">You have your role’s defaults; change anything and save to make it yours.</p> : null}

      <fieldset className="flex flex-col gap-1">
        <legend className="mb-2 text-base font-semibold text-frost-950">Which alerts</legend>
        <label className="flex min-h-11 items-start gap-3 py-1.5 text-sm">
          <input type="checkbox" checked disabled aria-describedby="frost-always" className="mt-0.5 size-6 shrink-0 accent-leaf-700" />
          <span>
            <span className="font-medium text-frost-950">{ALERT_KIND_LABELS.too_cold}</span>{" "}
            <span id="frost-always" className="font-medium text-leaf-800">
              always sent, also in quiet hours
            </span>
            <span className="block text-frost-700">{ALERT_KIND_MEANINGS.too_cold}</span>
          </span>
        </label>
        {CHOOSABLE_ALERT_KINDS.map((kind) => (
          <label key={kind} className="flex min-h-11 cursor-pointer items-start gap-3 py-1.5 text-sm">
            <input type="checkbox" value={kind} className="mt-0.5 size-6 shrink-0 accent-leaf-700" {...register("kinds")} />
            <span>
              <span className="font-medium text-frost-950">{ALERT_KIND_LABELS[kind]}</span>
              <span className="block text-frost-700">{ALERT_KIND_MEANINGS[kind]}</span>
            </span>
          </label>
        ))}
        {errors.kinds?.message ? <p className="text-sm text-ember-700">{errors.kinds.message}</p> : null}
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-base font-semibold text-frost-950">Quiet hours</legend>
        <p className="text-sm text-frost-700">
          Alerts that come in between these times wait until they end (times in {zone}; they may run over midnight, such as 22:00 to 07:00). Frost risk is never held
          back. Leave both empty for no quiet hours.
        </p>
        <div className="grid grid-cols-2 gap-3 sm:max-w-md">
          <Field label="From" error={errors.quietFrom?.message}>
            {(c) => <TextInput {...c} type="time" {...register("quietFrom")} />}
          </Field>
          <Field label="Until" error={errors.quietUntil?.message}>
            {(c) => <TextInput {...c} type="time" {...register("quietUntil")} />}
          </Field>
        </div>
        <button
          type="button"
          className="min-h-11 self-start rounded-lg px-2 text-sm font-medium text-leaf-800 underline underline-offset-2"
          onClick={() => {
            setValue("quietFrom", "", { shouldDirty: true });
            setValue("quietUntil", "", { shouldDirty: true });
          }}
        >
          No quiet hours
        </button>
      </fieldset>

      <fieldset className="flex flex-col gap-1">
        <legend className="mb-1 text-base font-semibold text-frost-950">Daily summary</legend>
        <label className="flex min-h-11 cursor-pointer items-center gap-3 text-sm text-frost-900">
          <input type="checkbox" className="size-6 accent-leaf-700" {...register("dailySummary")} />
          Send me the daily summary
        </label>
        <p className="text-sm text-frost-600">
          {summaryTime ? `It goes out at ${summaryTime} (${zone}).` : "The owner has not set a time for it yet, so none goes out for now."}
        </p>
      </fieldset>
    </FormShell>
  );
}
