import { bigint, decimal, index, int, mysqlTable, primaryKey } from "drizzle-orm/mysql-core";
import { instant, ref } from "./columns";
import { sensors } from "./devices";

/** Raw readings, kept for a limited time; older ones live on in the per-minute roll-up. */
export const readings = mysqlTable(
  "readings",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    sensorId: ref("sensor_id")
      .notNull()
      .references(() => sensors.id, { onDelete: "cascade" }),
    at: instant("at").notNull(),
    tempC: decimal("temp_c", { precision: 5, scale: 2, mode: "number" }),
    rh: decimal("rh", { precision: 5, scale: 2, mode: "number" }),
    battery: decimal("battery", { precision: 4, scale: 3, mode: "number" }),
  },
  (t) => [index("readings_sensor_at_idx").on(t.sensorId, t.at), index("readings_at_idx").on(t.at)],
);

export const readingMinutes = mysqlTable(
  "reading_minutes",
  {
    sensorId: ref("sensor_id")
      .notNull()
      .references(() => sensors.id, { onDelete: "cascade" }),
    minute: instant("minute").notNull(),
    samples: int("samples").notNull(),
    tempMinC: decimal("temp_min_c", { precision: 5, scale: 2, mode: "number" }),
    tempMaxC: decimal("temp_max_c", { precision: 5, scale: 2, mode: "number" }),
    tempMeanC: decimal("temp_mean_c", { precision: 5, scale: 2, mode: "number" }),
    rhMean: decimal("rh_mean", { precision: 5, scale: 2, mode: "number" }),
  },
  (t) => [primaryKey({ columns: [t.sensorId, t.minute] }), index("reading_minutes_minute_idx").on(t.minute)],
);
