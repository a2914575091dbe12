import { ALERT_KINDS } from "../../lib/domain";
import { bigint, index, json, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { user } from "./auth";
import { instant, ref } from "./columns";
import { plugs, sensors } from "./devices";
import { houses } from "./houses";
import { sites } from "./sites";


export const alerts = mysqlTable(
  "alerts",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    houseId: ref("house_id").references(() => houses.id, { onDelete: "cascade" }),
    plugId: ref("plug_id").references(() => plugs.id, { onDelete: "cascade" }),
    sensorId: ref("sensor_id").references(() => sensors.id, { onDelete: "cascade" }),
    kind: mysqlEnum("kind", ALERT_KINDS).notNull(),
    message: varchar("message", { length: 280 }).notNull(),
    detail: json("detail"),
    raisedAt: instant("raised_at").notNull(),
    clearedAt: instant("cleared_at"),
    acknowledgedAt: instant("acknowledged_at"),
    acknowledgedBy: ref("acknowledged_by").references(() => user.id, { onDelete: "set null" }),
  },
  (t) => [index("alerts_site_raised_idx").on(t.siteId, t.raisedAt)],
);
