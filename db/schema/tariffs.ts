import { date, decimal, index, mysqlEnum, mysqlTable, time, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { TARIFF_KINDS } from "@/lib/domain";
import { sites } from "./sites";

/** An electricity tariff: a standing charge per day and one or more unit rates. */
export const tariffs = mysqlTable(
  "tariffs",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 80 }).notNull(),
    kind: mysqlEnum("kind", TARIFF_KINDS).notNull(),
    /** In the site's currency per day. */
    standingChargePerDay: decimal("standing_charge_per_day", { precision: 10, scale: 4, mode: "number" }).notNull(),
    /** Tax (VAT, sales tax) in percent, added to the energy and the standing charge. */
    taxPercent: decimal("tax_percent", { precision: 5, scale: 2, mode: "number" }).notNull().default(0),
    /** First and last local date the tariff applies (inclusive); open-ended when null. */
    validFrom: date("valid_from", { mode: "string" }).notNull(),
    validUntil: date("valid_until", { mode: "string" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("tariffs_site_idx").on(t.siteId, t.validFrom)],
);

/**
 * A unit rate. A flat tariff has one rate covering the whole day; a time-of-use
 * tariff has several, each from `startsAt` to `endsAt` local time (wrapping past
 * midnight when `endsAt` <= `startsAt`) on the weekdays in `days` (RFC 5545 day codes).
 */
export const tariffRates = mysqlTable(
  "tariff_rates",
  {
    id: id(),
    tariffId: ref("tariff_id")
      .notNull()
      .references(() => tariffs.id, { onDelete: "cascade" }),
    label: varchar("label", { length: 40 }).notNull(),
    startsAt: time("starts_at").notNull(),
    endsAt: time("ends_at").notNull(),
    days: varchar("days", { length: 32 }).notNull().default("MO,TU,WE,TH,FR,SA,SU"),
    pricePerKwh: decimal("price_per_kwh", { precision: 10, scale: 5, mode: "number" }).notNull(),
  },
  (t) => [index("tariff_rates_tariff_idx").on(t.tariffId)],
);

/**
 * One electricity bill: its dates (local, inclusive), and what the bill itself says
 * (kWh and amount, tax included) for the bill check.
 */
export const billPeriods = mysqlTable(
  "bill_periods",
  {
    id: id(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    startsOn: date("starts_on", { mode: "string" }).notNull(),
    endsOn: date("ends_on", { mode: "string" }).notNull(),
    label: varchar("label", { length: 80 }),
    billedKwh: decimal("billed_kwh", { precision: 12, scale: 3, mode: "number" }),
    billedAmount: decimal("billed_amount", { precision: 12, scale: 2, mode: "number" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("bill_periods_site_dates_uq").on(t.siteId, t.startsOn, t.endsOn)],
);
