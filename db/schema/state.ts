// What the controller observes and does, apart from the settings the web app writes.
// The controller is the only writer of these tables; the pages and a restarted
// controller read a plug's present state from `plug_states` through one query
// (db/plug-states.ts).
import { bigint, boolean, int, mysqlEnum, mysqlTable, primaryKey, varchar } from "drizzle-orm/mysql-core";
import { SWITCH_CAUSES } from "../../lib/domain";
import { instant, ref } from "./columns";
import { plugs, sensors } from "./devices";
import { sites } from "./sites";

/** One row per plug: the state the switch log puts it in, why it is kept so now, and what it last said. */
export const plugStates = mysqlTable("plug_states", {
  plugId: ref("plug_id")
    .primaryKey()
    .references(() => plugs.id, { onDelete: "cascade" }),
  /** The state its last kept (not withdrawn) switch took it to; null before the first. */
  on: boolean("on"),
  /** When it got there: the acknowledgement of that switch, or when it was observed. */
  since: instant("since"),
  /** The command id of that switch in the switch log. */
  switchCommandId: varchar("switch_command_id", { length: 64 }),
  /** Why the controller keeps the plug as it is now (its latest decision's cause). */
  presentCause: mysqlEnum("present_cause", SWITCH_CAUSES),
  /** A switch on its way that the plug has not confirmed yet. */
  pendingOn: boolean("pending_on"),
  pendingCommandId: varchar("pending_command_id", { length: 64 }),
  pendingSince: instant("pending_since"),
  /** The anti-short-cycle guard lets the wanted change through at this instant. */
  guardUntil: instant("guard_until"),
  /** The plug's own last report; its time is the plug's own clock. */
  reportedOn: boolean("reported_on"),
  reportedAt: instant("reported_at"),
  watts: int("watts"),
  wattHours: bigint("watt_hours", { mode: "number", unsigned: true }),
  online: boolean("online").notNull().default(false),
  lastSeenAt: instant("last_seen_at"),
  updatedAt: instant("updated_at").notNull(),
});

/** One row per sensor: whether it is heard. */
export const sensorStates = mysqlTable("sensor_states", {
  sensorId: ref("sensor_id")
    .primaryKey()
    .references(() => sensors.id, { onDelete: "cascade" }),
  online: boolean("online").notNull().default(false),
  lastSeenAt: instant("last_seen_at"),
  updatedAt: instant("updated_at").notNull(),
});

/** Each running controller writes its row every few seconds; a missing beat means control has stopped. */
export const controllerHeartbeats = mysqlTable("controller_heartbeats", {
  instanceId: varchar("instance_id", { length: 64 }).primaryKey(),
  host: varchar("host", { length: 120 }).notNull(),
  pid: int("pid").notNull(),
  /** The sites it serves, by slug, comma-separated; null for all. */
  sites: varchar("sites", { length: 1000 }),
  startedAt: instant("started_at").notNull(),
  beatAt: instant("beat_at").notNull(),
  /** Set by a clean stop, so a stopped controller is told apart from a dead one. */
  stoppedAt: instant("stopped_at"),
});

/** What the broker's per-device limits did about a device's traffic, counted since the device was first limited. */
export const DEVICE_LIMIT_ACTIONS = ["slowed", "oversized", "disconnected"] as const;

export const deviceTraffic = mysqlTable(
  "device_traffic",
  {
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    deviceKind: mysqlEnum("device_kind", ["plug", "sensor"]).notNull(),
    deviceId: varchar("device_id", { length: 64 }).notNull(),
    /** Times the device sent faster than its limit and was held back. */
    slowed: int("slowed").notNull().default(0),
    /** Messages refused for being larger than the limit. */
    oversized: int("oversized").notNull().default(0),
    /** Times it was disconnected for going on past its limit. */
    disconnected: int("disconnected").notNull().default(0),
    lastAction: mysqlEnum("last_action", DEVICE_LIMIT_ACTIONS),
    lastAt: instant("last_at"),
    updatedAt: instant("updated_at").notNull(),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.deviceKind, t.deviceId] })],
);
