import type { Alert } from "./types";

export const SENSOR_QUIET = 1;
export const OVERLOAD = 2;
export const TOO_HOT = 4;

// Every combination prepared once, so a decision carries its alerts without allocating.
const SETS: readonly (readonly Alert[])[] = Array.from({ length: 8 }, (_, bits) => {
  const set: Alert[] = [];
  if (bits & SENSOR_QUIET) set.push("sensor_quiet");
  if (bits & OVERLOAD) set.push("overload");
  if (bits & TOO_HOT) set.push("too_hot");
  return Object.freeze(set);
});

/** The alert list for a combination of the flags above. */
export function alertSet(bits: number): readonly Alert[] {
  return SETS[bits & 7]!;
}
