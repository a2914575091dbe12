"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState, type ReactNode } from "react";
import { useForm, useWatch, type FieldPath, type Resolver, type UseFormRegister } from "react-hook-form";
import { HeaterSafetyNote } from "@/components/safety/HeaterSafetyNote";
import { NumberField } from "@/components/setup/NumberField";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { Button } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { alertRulesSchema, BATTERY_HYSTERESIS_PERCENT, DEFAULT_ALERT_RULES, type AlertRules } from "@/lib/alerts/rules";
import { placeFieldErrors, sendJson } from "@/lib/client/api";
import { unitSymbol } from "@/lib/units";
import { inUnit } from "@/components/setup/with-celsius";
import { draftOf, RULE_FIELDS, toRules, type RulesDraft } from "./rules-draft";

type Props = {
  siteId: string;
  house: { houseId: string; name: string; lowLimitC: number; rules: AlertRules; saved: boolean };
  /** alerts.manage: others see the rules without a way to change them. */
  canEdit: boolean;
};

const schemaResolver = zodResolver(alertRulesSchema);

/** The schema checks the rules in °C, as the handler will; errors keep the form's field names. */
function rulesResolver(unit: "c" | "f"): Resolver<RulesDraft, unknown, AlertRules> {
  return async (values, context, options) => {
    const result = await schemaResolver(toRules(values, unit), context, options as never);
    return Object.keys(result.errors).length ? { values: {}, errors: result.errors as never } : { values: result.values as AlertRules, errors: {} };
  };
}

const round1 = (n: number) => (Number.isFinite(n) ? String(Math.round(n * 10) / 10) : "…");
const minutes = (n: number) => (Number.isFinite(n) ? `${n}\u00a0min` : "…\u00a0min");

/** One house's alert rules: each rule with its unit, its switch, and in words how it opens and closes. */
export function AlertRulesForm({ siteId, house, canEdit }: Props) {
  const unit = useTemperatureUnit();
  const router = useRouter();
  const sym = unitSymbol(unit);
  const [serverError, setServerError] = useState<string | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    control,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<RulesDraft, unknown, AlertRules>({ resolver: rulesResolver(unit), defaultValues: draftOf(house.rules, unit, house.lowLimitC) });
  const d = useWatch({ control }) as RulesDraft;
  const houseFrost = inUnit(house.lowLimitC, unit);
  const frostAt = d.frostFollows === "house" ? houseFrost : d.frost?.belowC;
  const h = d.hysteresisK;

  const onSubmit = handleSubmit(async (rules) => {
    setServerError(null);
    setStatus(null);
    const result = await sendJson<{ house: Props["house"] }>(`/api/sites/${siteId}/alerts/rules/${house.houseId}`, "PUT", rules);
    if (!result.ok) {
      setServerError(placeFieldErrors(result.error, RULE_FIELDS, (name, message) => setError(name as FieldPath<RulesDraft>, { message })));
      return;
    }
    reset(draftOf(result.data.house.rules, unit, house.lowLimitC));
    setStatus(`Saved. The controller uses these rules for ${house.name} from now on.`);
    router.refresh();
  });

  const err = (path: string) => path.split(".").reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], errors) as { message?: string } | undefined;
  const num = (name: FieldPath<RulesDraft>, label: string, unitLabel: string, hint?: string, step: number | "any" = "any") => (
    <NumberField label={label} unit={unitLabel} hint={hint} step={step} error={err(name)?.message} register={register(name, { valueAsNumber: true })} />
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={`Alert rules of ${house.name}`}>
      {serverError ? <Notice tone="error">{serverError}</Notice> : null}
      {status ? (
        <p role="status" className="rounded-lg bg-leaf-50 px-3 py-2 text-sm text-leaf-800">
          {status}
        </p>
      ) : null}
      {!canEdit ? <p className="text-sm text-frost-600">Owners and growers change these rules; you can read them here.</p> : null}
      <fieldset disabled={!canEdit} className="flex flex-col gap-4">
        <Rule title="Frost risk" always words={`Opens only after the temperature has stayed at or below ${round1(frostAt)}\u00a0${sym} for ${minutes(d.frost?.holdMin)} (minimum duration); closes once back above ${round1(frostAt + h)}\u00a0${sym} (hysteresis). Sent to everyone, at any hour.`}>
          <div className="flex flex-col gap-2" role="radiogroup" aria-label="Frost alert temperature">
            <Choice register={register} name="frostFollows" value="house" label={`Follow the house’s frost limit (${round1(houseFrost)}\u00a0${sym})`} />
            <Choice register={register} name="frostFollows" value="own" label="Its own temperature" />
          </div>
          <div className="grid gap-4 sm:grid-cols-2">
            {d.frostFollows === "own" ? num("frost.belowC", "Frost alert below", sym) : null}
            {num("frost.holdMin", "Minimum duration", "min", undefined, 1)}
          </div>
        </Rule>

        <Rule title="Too warm" toggle={<Toggle register={register} name="tooWarm.enabled" rule="Too warm" />} words={`Opens only after the temperature has stayed above ${round1(d.tooWarm?.aboveC)}\u00a0${sym} for ${minutes(d.tooWarm?.holdMin)} (minimum duration); closes once back below ${round1(d.tooWarm?.aboveC - h)}\u00a0${sym} (hysteresis).`}>
          <div className="grid gap-4 sm:grid-cols-2">
            {num("tooWarm.aboveC", "Too warm above", sym)}
            {num("tooWarm.holdMin", "Minimum duration", "min", undefined, 1)}
          </div>
        </Rule>

        <Rule title="Temperature hysteresis" words="How far back past its limit a temperature must come before a frost, too-warm or near-dew-point alert closes, so a reading wavering at the limit sends one message, not one per crossing.">
          {num("hysteresisK", "Hysteresis", `${sym} difference`, `A difference: 0–5 K (0–9 °F).`)}
        </Rule>

        <Rule title="Sensor silent" toggle={<Toggle register={register} name="sensorSilent.enabled" rule="Sensor silent" />} words={`Opens when a sensor has sent nothing for ${minutes(d.sensorSilent?.afterMin)}; closes with its next reading.`}>
          {num("sensorSilent.afterMin", "Silent after", "min", undefined, 1)}
        </Rule>

        <Rule title="Sensor battery low" toggle={<Toggle register={register} name="batteryLow.enabled" rule="Sensor battery low" />} words={`Opens when a sensor reports less than ${round1(d.batteryLow?.belowPercent)}\u00a0%; closes once it reports ${BATTERY_HYSTERESIS_PERCENT} points more (hysteresis).`}>
          {num("batteryLow.belowPercent", "Battery below", "%")}
        </Rule>

        <Rule title="Plug offline" toggle={<Toggle register={register} name="plugOffline.enabled" rule="Plug offline" />} words={`Opens only after a plug has been offline or silent for ${minutes(d.plugOffline?.afterMin)} (minimum duration); closes once it answers again.`}>
          {num("plugOffline.afterMin", "Offline for", "min", undefined, 1)}
        </Rule>

        <Rule title="Plug not as commanded" toggle={<Toggle register={register} name="plugMismatch.enabled" rule="Plug not as commanded" />} words={`Opens only after a plug has reported another state than its last command for ${minutes(d.plugMismatch?.afterMin)} (minimum duration); closes once they agree.`}>
          {num("plugMismatch.afterMin", "Differing for", "min", undefined, 1)}
        </Rule>

        <Rule
          title="Condensation risk"
          toggle={<Toggle register={register} name="condensation.enabled" rule="Condensation risk" />}
          words={`Opens only after the air has stayed within ${round1(d.condensation?.dewMarginK)}\u00a0${sym} of its dew point for ${minutes(d.condensation?.holdMin)}, or humidity at or above ${round1(d.condensation?.humidAboveRh)}\u00a0% for ${round1(d.condensation?.humidHours)}\u00a0h (minimum duration); closes once the air is more than ${round1(d.condensation?.dewMarginK + h)}\u00a0${sym} above its dew point and humidity is back below ${round1(d.condensation?.humidAboveRh - d.condensation?.hysteresisRh)}\u00a0% (hysteresis).`}
        >
          <div className="grid gap-4 sm:grid-cols-2">
            {num("condensation.dewMarginK", "Margin to the dew point", `${sym} difference`)}
            {num("condensation.holdMin", "For at least", "min", undefined, 1)}
            {num("condensation.humidAboveRh", "Or humidity at or above", "%")}
            {num("condensation.humidHours", "For at least", "h")}
            {num("condensation.hysteresisRh", "Humidity hysteresis", "%")}
          </div>
        </Rule>

        <Rule title="Heater on for a long time" toggle={<Toggle register={register} name="heaterLongOn.enabled" rule="Heater on for a long time" />} words={`Opens when a heater has been on without a break for ${round1(d.heaterLongOn?.afterHours)}\u00a0h (a door left open, a faulty heater, a house losing heat); closes when it switches off.`}>
          {num("heaterLongOn.afterHours", "On longer than", "h")}
          <HeaterSafetyNote />
        </Rule>

        <Rule title="Reminders" words={`While an alert is open and nobody has acknowledged it, a reminder goes every ${minutes(d.reminderMin)}.`}>
          {num("reminderMin", "Reminder every", "min", undefined, 1)}
        </Rule>
      </fieldset>
      {canEdit ? (
        <div className="flex flex-col gap-2 sm:flex-row">
          <Button type="submit" pending={isSubmitting} pendingLabel="Saving…" className="w-full sm:w-auto">
            Save rules for {house.name}
          </Button>
          <Button
            variant="secondary"
            className="w-full sm:w-auto"
            onClick={() => {
              reset(draftOf(DEFAULT_ALERT_RULES, unit, house.lowLimitC), { keepDefaultValues: true });
              setStatus("The defaults are filled in. Save to keep them.");
            }}
          >
            Reset to defaults
          </Button>
          {isDirty ? <p className="self-center text-sm text-frost-600">Not saved yet.</p> : null}
        </div>
      ) : null}
    </form>
  );
}

function Rule({ title, words, toggle, always, children }: { title: string; words: string; toggle?: ReactNode; always?: boolean; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-3 rounded-lg border border-frost-200 p-3 sm:p-4">
      <legend className="px-1 text-base font-semibold text-frost-950">{title}</legend>
      {toggle ?? (always ? <p className="text-sm font-medium text-leaf-800">Always on</p> : null)}
      <p className="text-sm text-frost-700">{words}</p>
      {children}
    </fieldset>
  );
}

function Toggle({ register, name, rule }: { register: UseFormRegister<RulesDraft>; name: FieldPath<RulesDraft>; rule: string }) {
  return (
    <label className="inline-flex min-h-11 cursor-pointer items-center gap-3 self-start text-sm font-medium text-frost-900">
      <input type="checkbox" aria-label={`${rule}: on`} className="size-6 accent-leaf-700" {...register(name)} />
      On
    </label>
  );
}

function Choice({ register, name, value, label }: { register: UseFormRegister<RulesDraft>; name: "frostFollows"; value: string; label: string }) {
  return (
    <label className="flex min-h-11 cursor-pointer items-center gap-3 text-sm text-frost-900">
      <input type="radio" value={value} className="size-5 accent-leaf-700" {...register(name)} />
      {label}
    </label>
  );
}
