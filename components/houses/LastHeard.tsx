import { formatInstant, formatRelative } from "./format";

/** When a device was last heard from, relative, with the exact time on hover. */
export function LastHeard({ at, now, timeZone }: { at: Date; now: Date; timeZone: string }) {
  return (
    <time dateTime={at.toISOString()} title={formatInstant(at, timeZone)}>
      {formatRelative(at, now)}
    </time>
  );
}
