import { formatAmps, formatWatts } from "@/components/houses/format";
import { checkLoad } from "@/lib/control/electrical";
import type { Mains } from "@/lib/schemas/plug";

type LoadCheckProps = Mains & { watts: number; ratedCurrentA: number };

/**
 * The continuous-load check as the person types: what the appliance draws against what
 * the plug may carry for hours (checkLoad, the rule the handler and the controller's
 * safety cut-out apply too).
 */
export function LoadCheck({ watts, ratedCurrentA, mainsVoltage, continuousLoadPercent }: LoadCheckProps) {
  if (!(watts > 0) || !(ratedCurrentA > 0)) {
    return (
      <p role="status" className="rounded-lg border border-frost-200 bg-frost-50 px-3 py-2.5 text-sm text-frost-700">
        Enter the appliance’s watts and the plug’s rating to check the load.
      </p>
    );
  }
  const load = checkLoad({ watts, mainsVoltage, ratedCurrentA, continuousLoadPercent });
  const sums = `${formatWatts(watts)} at ${mainsVoltage} V draws about ${formatAmps(load.currentA)}; this plug may carry ${formatAmps(load.limitA)} for hours (${continuousLoadPercent} % of ${formatAmps(ratedCurrentA)}).`;
  if (!load.withinLimit) {
    return (
      <div role="status" className="rounded-lg border border-ember-200 bg-ember-50 px-3 py-2.5 text-sm text-ember-800">
        <p className="font-semibold">Too much for this plug</p>
        <p className="mt-1">{sums} Use a plug and circuit rated for the load, or a smaller appliance.</p>
      </div>
    );
  }
  // Within a tenth of the limit: our own threshold for "close" (as the plug notes), no published source.
  const close = load.currentA > load.limitA * 0.9;
  return (
    <div
      role="status"
      className={`rounded-lg border px-3 py-2.5 text-sm ${close ? "border-soil-300 bg-soil-50 text-soil-800" : "border-leaf-200 bg-leaf-50 text-leaf-800"}`}
    >
      <p className="font-semibold">{close ? "Within the limit, with little margin" : "Within the plug’s continuous rating"}</p>
      <p className="mt-1">{sums}</p>
    </div>
  );
}
