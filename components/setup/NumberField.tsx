import type { UseFormRegisterReturn } from "react-hook-form";
import { Field } from "@/components/ui/Field";
import { TextInput } from "@/components/ui/TextInput";

type NumberFieldProps = {
  label: string;
  unit?: string;
  hint?: string;
  error?: string;
  step?: number | "any";
  register: UseFormRegisterReturn;
};

/** A number typed on a phone: a decimal keypad, the unit beside the box. */
export function NumberField({ label, unit, hint, error, step = "any", register }: NumberFieldProps) {
  return (
    <Field label={unit ? `${label} (${unit})` : label} hint={hint} error={error}>
      {(control) => <TextInput {...control} type="number" inputMode="decimal" step={step} {...register} />}
    </Field>
  );
}
