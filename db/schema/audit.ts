import { bigint, index, json, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { user } from "./auth";
import { instant, ref } from "./columns";
import { sites } from "./sites";

/** Who changed what in a site's configuration, with the values before and after. */
export const auditLog = mysqlTable(
  "audit_log",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    userId: ref("user_id").references(() => user.id, { onDelete: "set null" }),
    at: instant("at").notNull(),
    /** What was done, e.g. `house.create`, `member.role`. */
    action: varchar("action", { length: 64 }).notNull(),
    entityType: varchar("entity_type", { length: 32 }).notNull(),
    entityId: varchar("entity_id", { length: 36 }).notNull(),
    before: json("before"),
    after: json("after"),
  },
  (t) => [
    index("audit_log_site_at_idx").on(t.siteId, t.at),
    index("audit_log_site_user_at_idx").on(t.siteId, t.userId, t.at),
    index("audit_log_site_entity_at_idx").on(t.siteId, t.entityType, t.at),
  ],
);
