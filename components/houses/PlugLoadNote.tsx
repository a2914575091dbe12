import { formatAmps } from "./format";

// Heaters run for hours at a time; plugs and sockets are commonly derated to about
// 80 % of their rating for continuous loads.
const CONTINUOUS_SHARE = 0.8;

type PlugLoadNoteProps = { watts: number; ratedCurrentA: number; mainsVoltage: number };

/** A caution when the appliance's current is over, or close to, the plug's rating. */
export function PlugLoadNote({ watts, ratedCurrentA, mainsVoltage }: PlugLoadNoteProps) {
  const amps = watts / mainsVoltage;
  if (amps > ratedCurrentA) {
    return (
      <p className="mt-1 text-xs font-medium text-ember-700">
        Draws about {formatAmps(amps)}, more than this plug’s {formatAmps(ratedCurrentA)} rating. Use a plug rated for the load.
      </p>
    );
  }
  if (amps > ratedCurrentA * CONTINUOUS_SHARE) {
    return (
      <p className="mt-1 text-xs text-soil-700">
        Draws about {formatAmps(amps)} of this plug’s {formatAmps(ratedCurrentA)}: little margin for a continuous load.
      </p>
    );
  }
  return null;
}
