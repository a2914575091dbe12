"use client";

import { useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import { Notice } from "@/components/ui/Notice";
import { MAX_REASON_LENGTH, OVERRIDE_DURATIONS, OVERRIDE_DURATION_LABELS } from "@/lib/override-durations";
import type { OverrideInput } from "@/lib/schemas/override";
import { clockMs } from "./confirmation";
import { errorMessage, panelUrl } from "./panel-data";
import { formatSiteTime, localInputValue } from "./time";

export type CreatedOverride = { id: string; on: boolean; startsAt: string; stopsAt: string | null };

type Props = {
  siteId: string;
  plugId: string;
  timeZone: string;
  now: Date;
  nextChangeAt: string | null;
  onCreated: (created: CreatedOverride, answeredAtMs: number) => void;
};

const HOUR_MS = 3600_000;

// zodResolver on the shared schema, loaded on first use (see override-resolver.ts); a
// touch of the form starts the load, so the press does not wait for it.
const loadResolver = () => import("./override-resolver").then((m) => m.overrideResolver);
const lazyResolver: Resolver<OverrideInput> = async (values, context, options) => (await loadResolver())(values, context, options);

/** How long, why, then one large press: on or off. */
export function OverrideForm({ siteId, plugId, timeZone, now, nextChangeAt, onCreated }: Props) {
  const [failure, setFailure] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setValue,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<OverrideInput>({
    resolver: lazyResolver,
    defaultValues: { duration: "1h", reason: "" },
  });
  const duration = useWatch({ control, name: "duration" });

  const submit = handleSubmit(async (input) => {
    setFailure(null);
    const body = { ...input, until: input.duration === "until" ? input.until : undefined, reason: input.reason || undefined };
    let response: Response;
    try {
      response = await fetch(panelUrl(siteId, plugId), {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(body),
      });
    } catch {
      setFailure("Cloche can’t be reached from this device right now. Nothing was switched.");
      return;
    }
    if (!response.ok) {
      const message = await errorMessage(response.clone());
      const fields = ((await response.json().catch(() => null)) as { error?: { fields?: Record<string, string> } } | null)?.error?.fields ?? {};
      for (const [field, text] of Object.entries(fields)) {
        if (field === "until" || field === "reason" || field === "duration") setError(field, { message: text });
      }
      setFailure(message);
      return;
    }
    const { override } = (await response.json()) as { override: { id: string; startsAt: string; stopsAt: string | null } };
    onCreated({ ...override, on: input.on }, clockMs());
  });

  const press = (on: boolean) => {
    setValue("on", on);
    void submit();
  };

  const nextChange = nextChangeAt ? new Date(nextChangeAt) : null;

  return (
    <form onSubmit={(e) => e.preventDefault()} onPointerDown={() => void loadResolver()} onFocus={() => void loadResolver()} noValidate className="flex flex-col gap-5" aria-label="Override this plug">
      <fieldset>
        <legend className="text-lg font-semibold text-frost-950">For how long</legend>
        <div className="mt-2 grid grid-cols-1 gap-2">
          {OVERRIDE_DURATIONS.map((d) => (
            <label
              key={d}
              className="flex min-h-14 cursor-pointer items-center gap-3 rounded-xl border-2 border-frost-300 bg-white px-4 text-lg font-medium text-frost-950 has-[:checked]:border-leaf-700 has-[:checked]:bg-leaf-50"
            >
              <input type="radio" value={d} {...register("duration")} className="size-6 accent-leaf-700" />
              <span>
                {OVERRIDE_DURATION_LABELS[d]}
                {d === "next_change" ? (
                  <span className="block text-sm font-normal text-frost-700">
                    {nextChange ? `at ${formatSiteTime(nextChange, now, timeZone)}` : "no change is coming"}
                  </span>
                ) : null}
              </span>
            </label>
          ))}
        </div>
        {errors.duration ? <p className="mt-1 text-base text-ember-700">{errors.duration.message}</p> : null}
      </fieldset>

      {duration === "until" ? (
        <div className="flex flex-col gap-1.5">
          <label htmlFor="override-until" className="text-base font-medium text-frost-900">
            Ends at ({timeZone})
          </label>
          <input
            id="override-until"
            type="datetime-local"
            className="min-h-14 rounded-xl border-2 border-frost-300 bg-white px-3 text-lg text-frost-950"
            defaultValue={localInputValue(new Date(now.getTime() + 2 * HOUR_MS), timeZone)}
            min={localInputValue(now, timeZone)}
            aria-invalid={errors.until ? true : undefined}
            aria-describedby={errors.until ? "override-until-error" : undefined}
            {...register("until", { shouldUnregister: true })}
          />
          {errors.until ? (
            <p id="override-until-error" className="text-base text-ember-700">
              {errors.until.message}
            </p>
          ) : null}
        </div>
      ) : null}

      <div className="flex flex-col gap-1.5">
        <label htmlFor="override-reason" className="text-base font-medium text-frost-900">
          Reason (optional)
        </label>
        <textarea
          id="override-reason"
          rows={2}
          maxLength={MAX_REASON_LENGTH}
          className="rounded-xl border-2 border-frost-300 bg-white px-3 py-2 text-lg text-frost-950"
          aria-invalid={errors.reason ? true : undefined}
          {...register("reason")}
        />
        {errors.reason ? <p className="text-base text-ember-700">{errors.reason.message}</p> : null}
      </div>

      {failure ? <Notice tone="error">{failure}</Notice> : null}

      <div className="grid grid-cols-2 gap-3">
        <button
          type="button"
          onClick={() => press(true)}
          disabled={isSubmitting}
          className="min-h-24 rounded-2xl bg-soil-700 text-2xl font-bold text-white active:bg-soil-900 disabled:opacity-60"
        >
          Switch on
        </button>
        <button
          type="button"
          onClick={() => press(false)}
          disabled={isSubmitting}
          className="min-h-24 rounded-2xl border-4 border-frost-800 bg-white text-2xl font-bold text-frost-950 active:bg-frost-100 disabled:opacity-60"
        >
          Switch off
        </button>
      </div>
      {isSubmitting ? (
        <p className="text-center text-base text-frost-700" aria-live="polite">
          Sending…
        </p>
      ) : null}
    </form>
  );
}
