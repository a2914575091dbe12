"use client";

import { describeInForce } from "@/lib/control/plan-words";
import { useTemperatureUnit } from "@/components/site/TemperatureUnit";
import { useNow, useSiteLive } from "./use-site-live";

/** What the plug follows now and the next change, in words; the guard's wait while it holds a change back. */
export function PlugInForce({ plugId }: { plugId: string }) {
  const live = useSiteLive();
  const now = useNow();
  const unit = useTemperatureUnit();
  const inForce = live?.data.plugs.find((p) => p.plugId === plugId)?.inForce;
  if (!live || !inForce) return null;
  const words = describeInForce(inForce, { unit, timeZone: live.timeZone, now });
  return (
    <div className="mt-1.5 border-l-2 border-leaf-300 pl-2.5">
      <p className="text-sm text-frost-900">
        <span className="sr-only">In force: </span>
        {words.line}
      </p>
      {words.detail ? <p className="text-xs text-frost-700">{words.detail}</p> : null}
      {words.guard ? <p className="mt-0.5 text-xs font-medium text-soil-800">{words.guard}</p> : null}
    </div>
  );
}
