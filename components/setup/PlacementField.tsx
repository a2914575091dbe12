import type { UseFormRegisterReturn } from "react-hook-form";
import { SENSOR_PLACEMENTS, SENSOR_PLACEMENT_LABELS, type SensorPlacement } from "@/lib/domain";

const WHAT_IT_DOES: Record<SensorPlacement, string> = {
  inside: "Its readings are the house’s temperature and humidity, on the houses page and for the plugs that follow it.",
  outside:
    "Its readings are the outside air, for the degree-day report; they are not shown as the house’s temperature. Mount it in shade, out of rain and wind, clear of the glass and its warmth.",
};

/** Where a sensor hangs, as two large choices. */
export function PlacementField({ register, error }: { register: UseFormRegisterReturn; error?: string }) {
  return (
    <fieldset className="flex flex-col gap-2" aria-invalid={error ? true : undefined}>
      <legend className="mb-1.5 text-sm font-medium text-frost-900">Placement</legend>
      {SENSOR_PLACEMENTS.map((placement) => (
        <label
          key={placement}
          className="flex min-h-11 cursor-pointer items-start gap-3 rounded-lg border border-frost-200 px-3 py-2.5 has-checked:border-leaf-600 has-checked:bg-leaf-50"
        >
          <input type="radio" value={placement} {...register} className="mt-1 size-5 shrink-0 accent-leaf-700" />
          <span>
            <span className="block text-sm font-semibold text-frost-950">{SENSOR_PLACEMENT_LABELS[placement]}</span>
            <span className="block text-sm text-frost-700">{WHAT_IT_DOES[placement]}</span>
          </span>
        </label>
      ))}
      {error ? <p className="text-sm text-ember-700">{error}</p> : null}
    </fieldset>
  );
}
