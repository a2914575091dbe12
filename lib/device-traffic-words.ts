// What the broker's per-device limits did to a device, in a few plain words.

export type TrafficCounts = { slowed: number; oversized: number; disconnected: number };

function times(n: number) {
  return n === 1 ? "once" : n === 2 ? "twice" : `${n} times`;
}

/** "held back 12 times, cut off twice and refused 1 message as too large"; null when nothing happened. */
export function trafficSummary({ slowed, oversized, disconnected }: TrafficCounts): string | null {
  const parts = [
    slowed > 0 ? `held back ${times(slowed)}` : null,
    disconnected > 0 ? `cut off ${times(disconnected)}` : null,
    oversized > 0 ? `refused ${oversized} ${oversized === 1 ? "message" : "messages"} as too large` : null,
  ].filter((p): p is string => p !== null);
  if (!parts.length) return null;
  return parts.length === 1 ? parts[0]! : `${parts.slice(0, -1).join(", ")} and ${parts.at(-1)}`;
}
