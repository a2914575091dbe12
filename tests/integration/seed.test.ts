import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { DEMO_MEMBERS, DEMO_SITE, seedDemo } from "@/db/seed";
import { houses, memberships, plugs, sensors } from "@/db/schema";

const TABLES = [
  "sites",
  "user",
  "account",
  "memberships",
  "houses",
  "sensors",
  "plugs",
  "schedules",
  "schedule_windows",
  "tariffs",
  "tariff_rates",
  "bill_periods",
];

async function snapshot() {
  const out: Record<string, unknown[]> = {};
  for (const table of TABLES) {
    const [rows] = await getPool().query(`SELECT * FROM \`${table}\` ORDER BY id`);
    out[table] = rows as unknown[];
  }
  return out;
}

describe("demo seed", () => {
  beforeAll(async () => {
    await seedDemo(getDb());
  });

  it("gives the same rows when run again", async () => {
    const before = await snapshot();
    const { created } = await seedDemo(getDb());
    expect(Object.values(created).every((n) => n === 0)).toBe(true);
    expect(await snapshot()).toEqual(before);
  });

  it("holds one market garden with three houses, their devices and four members, one per role", async () => {
    const db = getDb();
    const houseRows = await db.select().from(houses).where(eq(houses.siteId, DEMO_SITE.id));
    expect(houseRows.map((h) => h.kind).sort()).toEqual(["glasshouse", "polytunnel", "propagation"]);
    const plugRows = await db.select().from(plugs).where(eq(plugs.siteId, DEMO_SITE.id));
    expect(new Set(plugRows.map((p) => p.applianceKind))).toEqual(new Set(["heater", "fan", "light"]));
    expect((await db.select().from(sensors).where(eq(sensors.siteId, DEMO_SITE.id))).length).toBe(4);
    const roles = await db.select({ role: memberships.role }).from(memberships).where(eq(memberships.siteId, DEMO_SITE.id));
    expect(roles.map((r) => r.role).sort()).toEqual(["grower", "helper", "owner", "viewer"]);
    expect(DEMO_MEMBERS.every((m) => m.email.endsWith(".example"))).toBe(true);
  });

  it("keeps each heater within its plug's rating with the 80 % margin for continuous loads", async () => {
    // NEC 210.19/210.20: continuous loads held to 80 % of the rating; I = P / V.
    const heaters = (await getDb().select().from(plugs).where(eq(plugs.siteId, DEMO_SITE.id))).filter(
      (p) => p.applianceKind === "heater",
    );
    for (const heater of heaters) {
      expect(heater.applianceWatts / DEMO_SITE.mainsVoltage).toBeLessThanOrEqual(heater.ratedCurrentA * 0.8);
    }
  });
});
