import { bigint, boolean, decimal, index, int, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { SWITCH_CAUSES } from "../../lib/domain";
import { user } from "./auth";
import { instant, ref } from "./columns";
import { plugs } from "./devices";
import { overrides } from "./overrides";

export { SWITCH_CAUSES };

/** Every switch of every plug: runtime, kWh and cost are computed from this log. */
export const switchEvents = mysqlTable(
  "switch_events",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    plugId: ref("plug_id")
      .notNull()
      .references(() => plugs.id, { onDelete: "cascade" }),
    at: instant("at").notNull(),
    fromOn: boolean("from_on"),
    toOn: boolean("to_on").notNull(),
    cause: mysqlEnum("cause", SWITCH_CAUSES).notNull(),
    readingTempC: decimal("reading_temp_c", { precision: 5, scale: 2, mode: "number" }),
    readingAt: instant("reading_at"),
    userId: ref("user_id").references(() => user.id, { onDelete: "set null" }),
    overrideId: ref("override_id").references(() => overrides.id, { onDelete: "set null" }),
    /** Unique, so a switch written twice (after a retry or a restart) is stored once. */
    commandId: varchar("command_id", { length: 64 }).notNull().unique(),
    ackAt: instant("ack_at"),
    latencyMs: int("latency_ms"),
    /**
     * Set when a newer decision replaced this switch before the plug confirmed it: the
     * plug is taken to have stayed as it was (its next report says otherwise if not).
     * Such a row is history, not state: runtime and "on since" skip it.
     */
    withdrawnAt: instant("withdrawn_at"),
  },
  (t) => [index("switch_events_plug_at_idx").on(t.plugId, t.at), index("switch_events_at_idx").on(t.at)],
);
