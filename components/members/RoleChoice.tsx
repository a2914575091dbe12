import type { UseFormRegisterReturn } from "react-hook-form";
import { ROLES, ROLE_LABELS } from "@/lib/permissions";

/** The roles as large choices, each with what it allows (ROLE_LABELS). */
export function RoleChoice({ register, error }: { register: UseFormRegisterReturn; error?: string }) {
  return (
    <fieldset className="flex flex-col gap-2" aria-invalid={error ? true : undefined}>
      <legend className="mb-1.5 text-sm font-medium text-frost-900">Role</legend>
      {ROLES.map((role) => (
        <label
          key={role}
          className="flex min-h-11 cursor-pointer items-start gap-3 rounded-lg border border-frost-200 px-3 py-2.5 has-checked:border-leaf-600 has-checked:bg-leaf-50"
        >
          <input type="radio" value={role} {...register} className="mt-1 size-5 accent-leaf-700" />
          <span>
            <span className="block text-sm font-semibold text-frost-950">{ROLE_LABELS[role].name}</span>
            <span className="block text-sm text-frost-700">{ROLE_LABELS[role].summary}</span>
          </span>
        </label>
      ))}
      {error ? <p className="text-sm text-ember-700">{error}</p> : null}
    </fieldset>
  );
}
