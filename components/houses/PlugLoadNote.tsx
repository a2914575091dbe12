import { checkLoad } from "@/lib/control/electrical";
import { formatAmps } from "./format";

type PlugLoadNoteProps = { watts: number; ratedCurrentA: number; mainsVoltage: number; continuousLoadPercent: number };

/**
 * A caution when the appliance draws more than the plug may carry for hours (the
 * site's continuous-load margin, the same check the controller's safety cut-out uses,
 * so a plug named here is one Cloche keeps off), or close to it.
 */
export function PlugLoadNote({ watts, ratedCurrentA, mainsVoltage, continuousLoadPercent }: PlugLoadNoteProps) {
  const load = checkLoad({ watts, mainsVoltage, ratedCurrentA, continuousLoadPercent });
  if (!Number.isFinite(load.currentA)) return null;
  if (!load.withinLimit) {
    const over =
      load.currentA > ratedCurrentA
        ? `more than this plug’s ${formatAmps(ratedCurrentA)} rating`
        : `more than the ${formatAmps(load.limitA)} (${continuousLoadPercent} % of its ${formatAmps(ratedCurrentA)} rating) it may carry for hours`;
    return (
      <p className="mt-1 text-xs font-medium text-ember-700">
        Draws about {formatAmps(load.currentA)}, {over}. Cloche keeps it off: use a plug and circuit rated for the load.
      </p>
    );
  }
  // Within a tenth of the limit: our own threshold for "close", no published source.
  if (load.currentA > load.limitA * 0.9) {
    return (
      <p className="mt-1 text-xs text-soil-700">
        Draws about {formatAmps(load.currentA)} of the {formatAmps(load.limitA)} this plug may carry for hours: little margin left.
      </p>
    );
  }
  return null;
}
