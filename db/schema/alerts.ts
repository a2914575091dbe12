import { ALERT_KINDS, MAIL_PURPOSES, MAIL_STATUSES } from "../../lib/domain";
import type { AlertRules } from "../../lib/alerts/rules";
import {
  bigint,
  boolean,
  date,
  index,
  int,
  json,
  mediumtext,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  smallint,
  text,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { user } from "./auth";
import { instant, ref, updatedAt } from "./columns";
import { plugs, sensors } from "./devices";
import { houses } from "./houses";
import { sites } from "./sites";

/**
 * One row per episode of a condition: raised, perhaps acknowledged, cleared. The
 * controller writes the rows it raises and clears; the web app writes only the
 * "control stopped" ones (controller_silent: the controller cannot report its own
 * absence) and acknowledgements.
 */
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
    /** What was measured: { valueC, limitC, rh, dewPointC, battery, onSinceMs, … } as the rule saw it. */
    detail: json("detail"),
    raisedAt: instant("raised_at").notNull(),
    clearedAt: instant("cleared_at"),
    /** What "back to normal" looked like: the reading or state that closed it. */
    clearedMessage: varchar("cleared_message", { length: 280 }),
    acknowledgedAt: instant("acknowledged_at"),
    acknowledgedBy: ref("acknowledged_by").references(() => user.id, { onDelete: "set null" }),
  },
  (t) => [index("alerts_site_raised_idx").on(t.siteId, t.raisedAt), index("alerts_cleared_idx").on(t.clearedAt)],
);

/** A house's alert rules (lib/alerts/rules.ts); a house without a row has the defaults. */
export const houseAlertRules = mysqlTable("house_alert_rules", {
  houseId: ref("house_id")
    .primaryKey()
    .references(() => houses.id, { onDelete: "cascade" }),
  rules: json("rules").$type<AlertRules>().notNull(),
  updatedBy: ref("updated_by").references(() => user.id, { onDelete: "set null" }),
  updatedAt: updatedAt(),
});

/** A member's alert e-mails in a site (lib/alerts/preferences.ts); none yet means the role's defaults. */
export const alertPreferences = mysqlTable(
  "alert_preferences",
  {
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    userId: ref("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    /** The chosen kinds, as a JSON list; frost risk is never in it because it always goes. */
    kinds: json("kinds").$type<string[]>().notNull(),
    /** HH:MM in the site's zone; both null means no quiet hours. */
    quietFrom: varchar("quiet_from", { length: 5 }),
    quietUntil: varchar("quiet_until", { length: 5 }),
    dailySummary: boolean("daily_summary").notNull().default(false),
    updatedAt: updatedAt(),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.userId] })],
);

/**
 * What the notifier has done about each alert: when it told people it opened, how many
 * reminders went and when the last did, and when it told them it was back to normal.
 * Written by the notifier only (lib/server/alerts/).
 */
export const alertNotices = mysqlTable("alert_notices", {
  alertId: bigint("alert_id", { mode: "number", unsigned: true })
    .primaryKey()
    .references(() => alerts.id, { onDelete: "cascade" }),
  raisedAt: instant("raised_at"),
  reminders: smallint("reminders").notNull().default(0),
  lastReminderAt: instant("last_reminder_at"),
  clearedAt: instant("cleared_at"),
});

/**
 * Every e-mail the notifier means to send, written before it is sent (an outbox): a mail
 * server that is down delays a message, it never loses it. The content is fixed when
 * the row is written. `dedupe_key` makes writing it twice impossible.
 */
export const outboundMail = mysqlTable(
  "outbound_mail",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    userId: ref("user_id").references(() => user.id, { onDelete: "set null" }),
    toAddress: varchar("to_address", { length: 254 }).notNull(),
    purpose: mysqlEnum("purpose", MAIL_PURPOSES).notNull(),
    alertId: bigint("alert_id", { mode: "number", unsigned: true }).references(() => alerts.id, { onDelete: "cascade" }),
    /** The site's local day a daily summary covers. */
    summaryDay: date("summary_day", { mode: "string" }),
    dedupeKey: varchar("dedupe_key", { length: 160 }).notNull(),
    subject: varchar("subject", { length: 200 }).notNull(),
    bodyText: mediumtext("body_text").notNull(),
    bodyHtml: mediumtext("body_html"),
    status: mysqlEnum("status", MAIL_STATUSES).notNull().default("waiting"),
    /** When it is next to be tried (or, held, when quiet hours end). */
    dueAt: instant("due_at").notNull(),
    attempts: int("attempts").notNull().default(0),
    /** The last failure, or why it was skipped; shown in the app, never a stack trace. */
    lastError: varchar("last_error", { length: 500 }),
    lastTriedAt: instant("last_tried_at"),
    sentAt: instant("sent_at"),
    createdAt: instant("created_at").notNull(),
  },
  (t) => [
    uniqueIndex("outbound_mail_dedupe_uq").on(t.dedupeKey),
    index("outbound_mail_due_idx").on(t.status, t.dueAt),
    index("outbound_mail_alert_idx").on(t.alertId),
    index("outbound_mail_site_idx").on(t.siteId, t.createdAt),
  ],
);

/** One row per site and local day once its daily summary has been written to the outbox. */
export const dailySummaries = mysqlTable(
  "daily_summaries",
  {
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    day: date("day", { mode: "string" }).notNull(),
    composedAt: instant("composed_at").notNull(),
    recipients: int("recipients").notNull(),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.day] })],
);

/** Each upload of sensor history: what came in and what it added (a re-import adds 0). */
export const readingImports = mysqlTable(
  "reading_imports",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    siteId: ref("site_id")
      .notNull()
      .references(() => sites.id, { onDelete: "cascade" }),
    sensorId: ref("sensor_id")
      .notNull()
      .references(() => sensors.id, { onDelete: "cascade" }),
    fileName: varchar("file_name", { length: 255 }).notNull(),
    /** SHA-256 of the file's bytes, hex. */
    fileSha256: varchar("file_sha256", { length: 64 }).notNull(),
    /** The mapping, zone, date format, unit and decimal separator used. */
    options: json("options").notNull(),
    rowsRead: int("rows_read").notNull(),
    minutesAdded: int("minutes_added").notNull(),
    minutesAlreadyThere: int("minutes_already_there").notNull(),
    firstAt: instant("first_at"),
    lastAt: instant("last_at"),
    importedBy: ref("imported_by").references(() => user.id, { onDelete: "set null" }),
    importedAt: instant("imported_at").notNull(),
    note: text("note"),
  },
  (t) => [index("reading_imports_sensor_idx").on(t.sensorId, t.importedAt)],
);
