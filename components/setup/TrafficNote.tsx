import { LastHeard } from "@/components/houses/LastHeard";
import { trafficSummary, type TrafficCounts } from "@/lib/device-traffic-words";

type TrafficNoteProps = { traffic: TrafficCounts & { lastAt: Date | null }; now: Date; timeZone: string };

/**
 * A device the broker had to limit: what happened, what it means and what to look at,
 * as a strip along the bottom of the device's own card. Nothing when it never happened.
 */
export function TrafficNote({ traffic, now, timeZone }: TrafficNoteProps) {
  const summary = trafficSummary(traffic);
  if (!summary) return null;
  return (
    <div className="border-t border-soil-200 bg-soil-50 px-4 py-2.5 text-sm text-soil-800">
      <p className="font-semibold">
        Sending too much: {summary}
        {traffic.lastAt ? (
          <>
            , last <LastHeard at={traffic.lastAt} now={now} timeZone={timeZone} />
          </>
        ) : null}
        .
      </p>
      <p className="mt-1">
        Cloche slows down a device that sends far more often, or far larger messages, than a plug or sensor needs, so the other devices keep working.
        While it is held back its messages arrive late or not at all. Look for a faulty device or firmware, or a script or automation that uses its
        sign-in and sends in a loop.
      </p>
    </div>
  );
}
