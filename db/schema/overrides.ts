import { boolean, index, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { user } from "./auth";
import { createdAt, id, instant, ref } from "./columns";
import { plugs } from "./devices";

/** A person's manual on/off for a while; it wins over the schedule until it ends. */
export const overrides = mysqlTable(
  "overrides",
  {
    id: id(),
    plugId: ref("plug_id")
      .notNull()
      .references(() => plugs.id, { onDelete: "cascade" }),
    on: boolean("on").notNull(),
    startsAt: instant("starts_at").notNull(),
    /** Null with `untilNextChange`: it ends at the schedule's next change. */
    endsAt: instant("ends_at"),
    untilNextChange: boolean("until_next_change").notNull().default(false),
    userId: ref("user_id").references(() => user.id, { onDelete: "set null" }),
    reason: varchar("reason", { length: 280 }).notNull(),
    cancelledAt: instant("cancelled_at"),
    cancelledBy: ref("cancelled_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("overrides_plug_starts_idx").on(t.plugId, t.startsAt)],
);
