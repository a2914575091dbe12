/**
 * Fills for a tariff's rates in the week picture and its legend, in the order of the
 * rate list; each pair is told apart by lightness as well as hue.
 */
export const RATE_TONES = [
  "bg-leaf-600",
  "bg-soil-300",
  "bg-frost-700",
  "bg-leaf-200",
  "bg-soil-600",
  "bg-frost-300",
] as const;

export const rateTone = (index: number) => RATE_TONES[index % RATE_TONES.length]!;

/** No rate: white with a hatched red edge; two rates at once: ember. */
export const GAP_TONE = "bg-white border-2 border-dashed border-ember-600";
export const DOUBLED_TONE = "bg-ember-500";
