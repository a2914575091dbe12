import { sql } from "drizzle-orm";
import { datetime, varchar } from "drizzle-orm/mysql-core";
import { randomUUID } from "node:crypto";

/** An instant, stored in UTC with millisecond precision (the pool runs with timezone "Z"). */
export const instant = (name: string) => datetime(name, { mode: "date", fsp: 3 });

export const createdAt = () =>
  instant("created_at")
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`)
    .$defaultFn(() => new Date());

export const updatedAt = () =>
  instant("updated_at")
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`)
    .$defaultFn(() => new Date())
    .$onUpdateFn(() => new Date());

/** Keys made in the app (MySQL has no RETURNING). */
export const id = () =>
  varchar("id", { length: 36 })
    .primaryKey()
    .$defaultFn(() => randomUUID());

export const ref = (name: string) => varchar(name, { length: 36 });
