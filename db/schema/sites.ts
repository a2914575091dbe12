import { CONTINUOUS_LOAD_PERCENT, DEGREE_DAY_METHODS, ROLES } from "../../lib/domain";
import { char, index, mysqlEnum, mysqlTable, uniqueIndex, varchar, smallint, tinyint } from "drizzle-orm/mysql-core";
import { user } from "./auth";
import { createdAt, id, ref, updatedAt } from "./columns";

export { ROLES };

/** One grower's place: all its houses share a time zone, a currency and a mains voltage. */
export const sites = mysqlTable("sites", {
  id: id(),
  slug: varchar("slug", { length: 64 }).notNull().unique(),
  name: varchar("name", { length: 120 }).notNull(),
  /** IANA zone name, e.g. Europe/London: schedules and reports follow its wall clock. */
  timeZone: varchar("time_zone", { length: 64 }).notNull(),
  /** ISO 4217 code. */
  currency: char("currency", { length: 3 }).notNull(),
  mainsVoltage: smallint("mains_voltage").notNull().default(230),
  /** A load that runs for hours may draw at most this percent of its plug's rating (80 % in NEC 210.19(A)/210.20(A)). */
  continuousLoadPercent: tinyint("continuous_load_percent").notNull().default(CONTINUOUS_LOAD_PERCENT.default),
  degreeDayMethod: mysqlEnum("degree_day_method", DEGREE_DAY_METHODS).notNull().default("uk_met_office"),
  /** When the daily summary e-mail goes out, HH:MM in the site's zone; null: none. */
  summaryTime: varchar("summary_time", { length: 5 }),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const memberships = mysqlTable(
  "memberships",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    userId: ref("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("memberships_site_user_uq").on(t.siteId, t.userId), index("memberships_user_idx").on(t.userId)],
);
