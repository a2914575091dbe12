import type { ComponentPropsWithRef } from "react";
import { Select } from "@/components/ui/Select";

type TimeZoneSelectProps = Omit<ComponentPropsWithRef<"select">, "children"> & {
  /** Zones to offer; the field's current value is always offered too. */
  zones: readonly string[] | null;
  current: string;
};

const label = (zone: string) => zone.replaceAll("_", " ").replaceAll("/", " / ");

export function TimeZoneSelect({ zones, current, ...rest }: TimeZoneSelectProps) {
  const options = zones?.includes(current) ? zones : [current, ...(zones ?? [])];
  return (
    <Select {...rest}>
      {options.map((zone) => (
        <option key={zone} value={zone}>
          {label(zone)}
        </option>
      ))}
    </Select>
  );
}
