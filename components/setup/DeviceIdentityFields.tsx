import type { UseFormRegisterReturn } from "react-hook-form";
import { Field } from "@/components/ui/Field";
import { Select } from "@/components/ui/Select";
import { TextInput } from "@/components/ui/TextInput";

type Identity = { name: string; deviceId: string; houseId: string };
type Errors = Partial<Record<keyof Identity, { message?: string }>>;

/** A plug's or sensor's name, its device id (fixed once added) and its house. */
export function DeviceIdentityFields({
  fields,
  errors,
  houses,
  added,
  nameExample,
  idExample,
  topics,
}: {
  /** The form's registrations of these three fields. */
  fields: Record<keyof Identity, UseFormRegisterReturn>;
  errors: Errors;
  houses: { id: string; name: string }[];
  /** The device exists already: its id can no longer change. */
  added: boolean;
  nameExample: string;
  idExample: string;
  /** "topics" or "topic": what the id names. */
  topics: string;
}) {
  return (
    <>
      <Field label="Name" hint={`E.g. “${nameExample}”.`} error={errors.name?.message}>
        {(c) => <TextInput {...c} {...fields.name} />}
      </Field>
      <Field
        label="Device id"
        hint={added ? `Fixed once added: the device’s ${topics} and sign-in are named after it.` : `Its name on the broker: lower-case letters, digits and dashes, e.g. ${idExample}.`}
        error={errors.deviceId?.message}
      >
        {(c) => <TextInput {...c} autoCapitalize="none" autoCorrect="off" spellCheck={false} readOnly={added} {...fields.deviceId} />}
      </Field>
      <Field label="House" error={errors.houseId?.message}>
        {(c) => (
          <Select {...c} {...fields.houseId}>
            {houses.map((h) => (
              <option key={h.id} value={h.id}>
                {h.name}
              </option>
            ))}
          </Select>
        )}
      </Field>
    </>
  );
}
