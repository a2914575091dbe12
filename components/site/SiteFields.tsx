import type { UseFormRegisterReturn } from "react-hook-form";
import { Field } from "@/components/ui/Field";
import { TextInput } from "@/components/ui/TextInput";
import { CurrencySelect } from "./CurrencySelect";
import { TimeZoneSelect } from "./TimeZoneSelect";

type SiteFieldsProps = {
  register: {
    siteName: UseFormRegisterReturn<"siteName">;
    timeZone: UseFormRegisterReturn<"timeZone">;
    currency: UseFormRegisterReturn<"currency">;
  };
  errors: { siteName?: string; timeZone?: string; currency?: string };
  timeZone: string;
  zones: readonly string[] | null;
};

/** Name, time zone and currency of a site: shared by sign-up and the new-site form. */
export function SiteFields({ register, errors, timeZone, zones }: SiteFieldsProps) {
  return (
    <>
      <Field label="Site name" hint="The place your houses stand, e.g. “Allotment 14” or “Home nursery”." error={errors.siteName}>
        {(control) => <TextInput {...control} autoComplete="organization" {...register.siteName} />}
      </Field>
      <Field label="Time zone" hint="Schedules follow the clock of this zone." error={errors.timeZone}>
        {(control) => <TimeZoneSelect {...control} zones={zones} current={timeZone} {...register.timeZone} />}
      </Field>
      <Field label="Currency" hint="Used for tariffs and running costs." error={errors.currency}>
        {(control) => <CurrencySelect {...control} {...register.currency} />}
      </Field>
    </>
  );
}
