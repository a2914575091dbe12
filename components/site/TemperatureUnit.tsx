"use client";

import { createContext, useContext, type ReactNode } from "react";
import type { TemperatureUnit } from "@/lib/domain";
import { formatTemperature } from "@/lib/units";

const UnitContext = createContext<TemperatureUnit>("c");

/** The signed-in person's °C/°F choice, given once by the site layout. */
export function TemperatureUnitProvider({ unit, children }: { unit: TemperatureUnit; children: ReactNode }) {
  return <UnitContext.Provider value={unit}>{children}</UnitContext.Provider>;
}

export function useTemperatureUnit(): TemperatureUnit {
  return useContext(UnitContext);
}

/** A temperature in °C, shown in the person's unit. */
export function Temperature({ c, digits = 1 }: { c: number | null | undefined; digits?: number }) {
  const unit = useTemperatureUnit();
  return <>{formatTemperature(c, unit, digits)}</>;
}
