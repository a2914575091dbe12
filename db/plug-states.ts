// A plug's present state, as the controller stores it (db/schema/state.ts). The one
// query that both the pages and a restarted controller read it through.
import { inArray } from "drizzle-orm";
import type { Database } from "@/db/client";
import { plugStates } from "@/db/schema";
import type { StoredSwitchState } from "@/lib/control/switch-lifecycle";

export type PlugPresentState = typeof plugStates.$inferSelect;

export async function loadPlugStates(db: Database, plugIds: readonly string[]): Promise<Map<string, PlugPresentState>> {
  if (plugIds.length === 0) return new Map();
  const rows = await db.select().from(plugStates).where(inArray(plugStates.plugId, [...plugIds]));
  return new Map(rows.map((row) => [row.plugId, row]));
}

/** What a restarted controller carries on from: the end of the log's chain, and a switch that was on its way. */
export function storedSwitchState(row: PlugPresentState | undefined, nowMs: number): StoredSwitchState | null {
  if (!row) return null;
  const pending = row.pendingCommandId && row.pendingOn !== null ? { id: row.pendingCommandId, on: row.pendingOn, sinceMs: row.pendingSince?.getTime() ?? nowMs } : null;
  return {
    on: row.on,
    sinceMs: row.since?.getTime() ?? null,
    switchId: row.switchCommandId,
    pending,
    presentCause: row.presentCause,
    newestReportMs: row.reportedAt?.getTime() ?? null,
  };
}
