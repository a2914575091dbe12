import { bigint, boolean, date, decimal, double, index, int, mysqlEnum, mysqlTable, primaryKey, varchar } from "drizzle-orm/mysql-core";
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
    /** The appliance's rated watts when the switch was made: energy "from rated power" uses it. */
    ratedWatts: int("rated_watts"),
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
  (t) => [
    index("switch_events_plug_at_idx").on(t.plugId, t.at),
    index("switch_events_at_idx").on(t.at),
    index("switch_events_cause_at_idx").on(t.cause, t.at),
  ],
);

/** A plug's energy meter as it reported it: metered kWh comes from the differences. */
export const meterSamples = mysqlTable(
  "meter_samples",
  {
    plugId: ref("plug_id")
      .notNull()
      .references(() => plugs.id, { onDelete: "cascade" }),
    at: instant("at").notNull(),
    /** The plug's own counter; it starts again from zero when the plug is reset. */
    wattHours: bigint("watt_hours", { mode: "number", unsigned: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.plugId, t.at] })],
);

/**
 * The energy roll-up: each plug's runtime and energy per local day and tariff rate,
 * from the switch log's closed on-intervals and the meter's samples (db/energy-days.ts
 * keeps it; `npm run energy:rebuild` makes it again from the log). `rateKey` is the
 * tariff rate in force, or "" where no tariff covers the time.
 */
export const energyDays = mysqlTable(
  "energy_days",
  {
    plugId: ref("plug_id")
      .notNull()
      .references(() => plugs.id, { onDelete: "cascade" }),
    day: date("day", { mode: "string" }).notNull(),
    rateKey: varchar("rate_key", { length: 36 }).notNull().default(""),
    onMs: bigint("on_ms", { mode: "number" }).notNull(),
    /** Rated watts × milliseconds on: exact, so sums agree with the raw log to the watt-second. */
    ratedWattMs: bigint("rated_watt_ms", { mode: "number" }).notNull(),
    /** From the plug's meter, in watt-seconds; null where the plug does not meter. */
    meteredWs: double("metered_ws"),
  },
  (t) => [primaryKey({ columns: [t.plugId, t.day, t.rateKey] })],
);
