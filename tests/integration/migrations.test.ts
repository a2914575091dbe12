import { randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";
import { migrateDatabase } from "@/db/migrate";

const base = new URL(process.env.DATABASE_URL!);
const name = `cloche_test_empty_${randomUUID().slice(0, 8)}`;
const target = new URL(base);
target.pathname = `/${name}`;

const admin = await mysql.createConnection({ uri: base.toString() });

afterAll(async () => {
  await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await admin.end();
});

async function tables() {
  const [rows] = await admin.query(
    "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? ORDER BY table_name",
    [name],
  );
  return (rows as { t: string }[]).map((r) => r.t).sort();
}

describe("migrations", () => {
  it("build the whole schema on an empty database, and a second run changes nothing", async () => {
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    expect(await tables()).toEqual([]);

    await migrateDatabase(target.toString());
    const created = await tables();
    expect(created).toEqual(
      [
        "__drizzle_migrations",
        "account",
        "alert_notices",
        "alert_preferences",
        "alerts",
        "audit_log",
        "bill_periods",
        "controller_heartbeats",
        "daily_summaries",
        "device_credentials",
        "device_traffic",
        "energy_days",
        "house_alert_rules",
        "houses",
        "invitations",
        "memberships",
        "meter_samples",
        "outbound_mail",
        "overrides",
        "plug_states",
        "plugs",
        "reading_imports",
        "reading_minutes",
        "readings",
        "schedule_exceptions",
        "schedule_windows",
        "schedules",
        "sensor_states",
        "sensors",
        "session",
        "sites",
        "switch_events",
        "tariff_rates",
        "tariffs",
        "user",
        "user_settings",
        "verification",
      ].sort(),
    );

    await migrateDatabase(target.toString());
    expect(await tables()).toEqual(created);
    const [applied] = await admin.query(`SELECT COUNT(*) AS n FROM \`${name}\`.__drizzle_migrations`);
    expect(Number((applied as { n: number }[])[0]!.n)).toBeGreaterThan(0);
  });

  it("store instants in UTC with millisecond precision", async () => {
    const [rows] = await admin.query(
      "SELECT column_name AS c, column_type AS t FROM information_schema.columns WHERE table_schema = ? AND table_name = 'switch_events' AND column_name IN ('at','ack_at')",
      [name],
    );
    for (const row of rows as { c: string; t: string }[]) expect(row.t).toBe("datetime(3)");
  });
});
