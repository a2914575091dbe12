import type { FieldValues, Resolver } from "react-hook-form";
import type { TemperatureUnit } from "@/lib/domain";
import { fromUnit, toUnit } from "@/lib/units";

/**
 * A resolver for a form whose temperature fields are typed in the person's unit: the
 * values go to the schema (and on to the handler) in °C.
 */
export function withCelsius<In extends FieldValues, Out>(
  resolver: Resolver<In, unknown, Out>,
  unit: TemperatureUnit,
  fields: readonly (keyof In & string)[],
): Resolver<In, unknown, Out> {
  return (values, context, options) => {
    const converted = { ...values };
    for (const field of fields) {
      const value = converted[field];
      if (typeof value === "number") (converted as Record<string, unknown>)[field] = fromUnit(value, unit);
    }
    return resolver(converted, context, options);
  };
}

/** A stored °C value as the form shows it: in the person's unit, to a tenth. */
export function inUnit(c: number, unit: TemperatureUnit): number {
  return Math.round(toUnit(c, unit) * 10) / 10;
}
