import { HOUSE_KINDS, GLAZINGS } from "../../lib/domain";
import { decimal, index, mysqlEnum, mysqlTable, text, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { sites } from "./sites";

export { HOUSE_KINDS, GLAZINGS };

/** A heated growing space. Dimensions and glazing feed the heat-loss sums. */
export const houses = mysqlTable(
  "houses",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 80 }).notNull(),
    kind: mysqlEnum("kind", HOUSE_KINDS).notNull(),
    lengthM: decimal("length_m", { precision: 6, scale: 2, mode: "number" }).notNull(),
    widthM: decimal("width_m", { precision: 6, scale: 2, mode: "number" }).notNull(),
    /** Height at the eaves (polytunnels: the height of the hoops' shoulders). */
    eaveHeightM: decimal("eave_height_m", { precision: 5, scale: 2, mode: "number" }).notNull(),
    ridgeHeightM: decimal("ridge_height_m", { precision: 5, scale: 2, mode: "number" }).notNull(),
    glazing: mysqlEnum("glazing", GLAZINGS).notNull(),
    /** Air changes per hour through gaps and vents when closed. */
    airChangesPerHour: decimal("air_changes_per_hour", { precision: 4, scale: 2, mode: "number" })
      .notNull()
      .default(1),
    /** Frost limit: bands may not reach below it, and it is the "too cold" alarm (alerts). */
    lowLimitC: decimal("low_limit_c", { precision: 4, scale: 1, mode: "number" }).notNull().default(2),
    /** Safety cut-out: heaters are switched off at or above this temperature. */
    highLimitC: decimal("high_limit_c", { precision: 4, scale: 1, mode: "number" }).notNull().default(35),
    notes: text("notes"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("houses_site_idx").on(t.siteId)],
);
