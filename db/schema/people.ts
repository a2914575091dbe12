import { index, mysqlEnum, mysqlTable, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { ROLES, TEMPERATURE_UNITS } from "../../lib/domain";
import { user } from "./auth";
import { createdAt, id, instant, ref, updatedAt } from "./columns";
import { sites } from "./sites";

/** A person's own settings, the same in every site they belong to. */
export const userSettings = mysqlTable("user_settings", {
  userId: ref("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  temperatureUnit: mysqlEnum("temperature_unit", TEMPERATURE_UNITS).notNull().default("c"),
  updatedAt: updatedAt(),
});

/**
 * An owner's invitation to join a site with a role. The link carries a random token;
 * only its hash is kept. It can be used once, until it expires or is withdrawn.
 */
export const invitations = mysqlTable(
  "invitations",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    email: varchar("email", { length: 255 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    invitedBy: ref("invited_by").references(() => user.id, { onDelete: "set null" }),
    expiresAt: instant("expires_at").notNull(),
    acceptedAt: instant("accepted_at"),
    acceptedBy: ref("accepted_by").references(() => user.id, { onDelete: "set null" }),
    withdrawnAt: instant("withdrawn_at"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("invitations_token_uq").on(t.tokenHash), index("invitations_site_idx").on(t.siteId, t.createdAt)],
);
