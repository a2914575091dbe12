// A plug's present state, as the controller stores it (db/schema/state.ts). The one
// query that both the pages and a restarted controller read it through.
import { inArray } from "drizzle-orm";
import type { Database } from "@/db/client";
import { plugStates } from "@/db/schema";

export type PlugPresentState = typeof plugStates.$inferSelect;

export async function loadPlugStates(db: Database, plugIds: readonly string[]): Promise<Map<string, PlugPresentState>> {
  if (plugIds.length === 0) return new Map();
  const rows = await db.select().from(plugStates).where(inArray(plugStates.plugId, [...plugIds]));
  return new Map(rows.map((row) => [row.plugId, row]));
}
