import type { WindowMode } from "@/lib/domain";

/** Calm fills for the three kinds of window, shared by the grid, the list and the preview. */
export const WINDOW_TONES: Record<WindowMode | "frost" | "override", string> = {
  band: "border-leaf-600 bg-leaf-100 text-leaf-900",
  on: "border-soil-500 bg-soil-100 text-soil-900",
  off: "border-frost-400 bg-frost-200 text-frost-800",
  frost: "border-dashed border-frost-500 bg-white text-frost-900",
  override: "border-ember-500 bg-ember-50 text-ember-900",
};
