import { APPLIANCE_KINDS, DEFAULT_STALE_AFTER_S, FAILSAFE_MODES, OUTSIDE_WINDOW_MODES, SENSOR_PLACEMENTS } from "../../lib/domain";
import {
  boolean,
  decimal,
  index,
  int,
  mysqlEnum,
  mysqlTable,
  smallint,
  tinyint,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { createdAt, id, instant, ref, updatedAt } from "./columns";
import { houses } from "./houses";
import { sites } from "./sites";


/** A temperature/humidity sensor in a house. */
export const sensors = mysqlTable(
  "sensors",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    houseId: ref("house_id")
      .notNull()
      .references(() => houses.id, { onDelete: "cascade" }),
    /** MQTT device id: the `{device}` segment of its topics. */
    deviceId: varchar("device_id", { length: 64 }).notNull(),
    name: varchar("name", { length: 80 }).notNull(),
    /** Inside its house, or outside it (the site's outside temperature, for degree-days). */
    placement: mysqlEnum("placement", SENSOR_PLACEMENTS).notNull().default("inside"),
    /** Retired: kept for its history, no longer signed in, read or shown among the working devices. */
    retiredAt: instant("retired_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("sensors_site_device_uq").on(t.siteId, t.deviceId), index("sensors_house_idx").on(t.houseId)],
);

/** A switched socket and the appliance plugged into it. */
export const plugs = mysqlTable(
  "plugs",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    houseId: ref("house_id")
      .notNull()
      .references(() => houses.id, { onDelete: "cascade" }),
    deviceId: varchar("device_id", { length: 64 }).notNull(),
    name: varchar("name", { length: 80 }).notNull(),
    applianceKind: mysqlEnum("appliance_kind", APPLIANCE_KINDS).notNull(),
    applianceWatts: int("appliance_watts").notNull(),
    /** The plug's rated current in amperes; the appliance's current must stay within it. */
    ratedCurrentA: decimal("rated_current_a", { precision: 4, scale: 1, mode: "number" }).notNull(),
    metersEnergy: boolean("meters_energy").notNull().default(false),
    /** The sensor whose readings the plug's bands are judged against. */
    sensorId: ref("sensor_id").references(() => sensors.id, { onDelete: "set null" }),
    /** What the plug does when that sensor goes quiet. */
    failsafe: mysqlEnum("failsafe", FAILSAFE_MODES).notNull().default("off"),
    /** With failsafe "duty": percent of each duty period spent on. */
    failsafeDutyPercent: tinyint("failsafe_duty_percent"),
    failsafeDutyPeriodS: smallint("failsafe_duty_period_s").notNull().default(1200),
    /** A reading older than this counts as stale. */
    staleAfterS: int("stale_after_s").notNull().default(DEFAULT_STALE_AFTER_S),
    outsideWindows: mysqlEnum("outside_windows", OUTSIDE_WINDOW_MODES).notNull().default("off"),
    frostLowC: decimal("frost_low_c", { precision: 4, scale: 1, mode: "number" }),
    frostHighC: decimal("frost_high_c", { precision: 4, scale: 1, mode: "number" }),
    /** Anti-short-cycle guard: least time on, and least time off, before a change. */
    minOnS: int("min_on_s").notNull().default(180),
    minOffS: int("min_off_s").notNull().default(180),
    /** How long a command holds; past it the plug falls back to its own fail-safe. */
    leaseS: int("lease_s").notNull().default(900),
    /** Retired: kept for its history, no longer switched, signed in or shown among the working devices. */
    retiredAt: instant("retired_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("plugs_site_device_uq").on(t.siteId, t.deviceId), index("plugs_house_idx").on(t.houseId)],
);

export const DEVICE_KINDS = ["plug", "sensor", "controller", "webapp"] as const;

/** MQTT sign-in of one device; only a hash of the secret is kept. */
export const deviceCredentials = mysqlTable(
  "device_credentials",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    deviceKind: mysqlEnum("device_kind", DEVICE_KINDS).notNull(),
    deviceId: varchar("device_id", { length: 64 }).notNull(),
    /** MQTT user name, unique across the broker. */
    username: varchar("username", { length: 160 }).notNull().unique(),
    /** Salted SHA-256 of a random 256-bit secret, `sha256$salt$hash` (base64url); a slow hash adds nothing to a secret that long. */
    secretHash: varchar("secret_hash", { length: 255 }).notNull(),
    createdAt: createdAt(),
    revokedAt: instant("revoked_at"),
  },
  (t) => [index("device_credentials_device_idx").on(t.siteId, t.deviceId)],
);
