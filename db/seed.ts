// The demo scenario: an invented market garden with three houses. Every row has a
// fixed id, and rows that exist already are left as they are, so seeding twice gives
// the same rows and a demo that someone has changed keeps their changes.
import { createHash } from "node:crypto";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { eq, inArray } from "drizzle-orm";
import type { MySqlColumn } from "drizzle-orm/mysql-core";
import { hashPassword } from "better-auth/crypto";
import { connect, type Database } from "./client";
import {
  account,
  billPeriods,
  houses,
  memberships,
  plugs,
  scheduleWindows,
  schedules,
  sensors,
  sites,
  tariffRates,
  tariffs,
  user,
} from "./schema";
import type { Role } from "../lib/permissions";

/** A stable UUID-shaped id for a demo row. */
export function demoId(key: string) {
  const hex = createHash("sha256").update(`cloche-demo:${key}`).digest("hex");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-5${hex.slice(13, 16)}-a${hex.slice(17, 20)}-${hex.slice(20, 32)}`;
}

const SEEDED_AT = new Date("2026-01-05T09:00:00.000Z");
const stamps = { createdAt: SEEDED_AT, updatedAt: SEEDED_AT };

export const DEMO_SITE = {
  id: demoId("site"),
  slug: "fernhollow",
  name: "Fernhollow Market Garden",
  timeZone: "Europe/London",
  currency: "GBP",
  mainsVoltage: 230,
  /** The daily summary e-mail goes to the owner at half past seven, covering the day before. */
  summaryTime: "07:30",
};

export const DEMO_MEMBERS: { key: string; name: string; email: string; password: string; role: Role }[] = [
  { key: "owner", name: "Wren Halloway", email: "owner@fernhollow.example", password: "fernhollow-owner", role: "owner" },
  { key: "grower", name: "Joss Penhallow", email: "grower@fernhollow.example", password: "fernhollow-grower", role: "grower" },
  { key: "helper", name: "Tam Oduya", email: "helper@fernhollow.example", password: "fernhollow-helper", role: "helper" },
  { key: "viewer", name: "Lise Brockhurst", email: "viewer@fernhollow.example", password: "fernhollow-viewer", role: "viewer" },
];

const site = DEMO_SITE.id;

const demoHouses = [
  {
    id: demoId("house:glass"),
    siteId: site,
    name: "Long Glasshouse",
    kind: "glasshouse" as const,
    lengthM: 10,
    widthM: 4,
    eaveHeightM: 2.1,
    ridgeHeightM: 3,
    glazing: "single_glass" as const,
    airChangesPerHour: 1.5,
    highLimitC: 32,
    notes: "Tomatoes and chillies on the south bench; citrus overwinters at the far end.",
  },
  {
    id: demoId("house:tunnel"),
    siteId: site,
    name: "Orchard Tunnel",
    kind: "polytunnel" as const,
    lengthM: 20,
    widthM: 6,
    eaveHeightM: 1.6,
    ridgeHeightM: 3,
    glazing: "double_film_inflated" as const,
    airChangesPerHour: 1,
    highLimitC: 35,
    notes: "Winter salads and overwintering perennials; kept just frost-free.",
  },
  {
    id: demoId("house:seedling"),
    siteId: site,
    name: "Seedling House",
    kind: "propagation" as const,
    lengthM: 6,
    widthM: 3.5,
    eaveHeightM: 2,
    ridgeHeightM: 2.8,
    glazing: "twin_wall_polycarbonate" as const,
    airChangesPerHour: 0.8,
    highLimitC: 30,
    notes: "Spring sowings under lights.",
  },
] as const;

const [glass, tunnel, seedling] = demoHouses;

const demoSensors = [
  { id: demoId("sensor:glass"), siteId: site, houseId: glass.id, deviceId: "glass-air", name: "Glasshouse air" },
  { id: demoId("sensor:tunnel"), siteId: site, houseId: tunnel.id, deviceId: "tunnel-air", name: "Tunnel air" },
  { id: demoId("sensor:seedling"), siteId: site, houseId: seedling.id, deviceId: "seedling-air", name: "Seedling bench" },
  // Mounted on the glasshouse's shaded north end, reading the outside air for degree-days.
  { id: demoId("sensor:yard"), siteId: site, houseId: glass.id, deviceId: "yard-air", name: "Yard air", placement: "outside" as const },
];

type PlugRow = typeof plugs.$inferInsert;
const plug = (key: string, row: Omit<PlugRow, "id" | "siteId">): PlugRow => ({ id: demoId(`plug:${key}`), siteId: site, ...row });

// UK sockets (BS 1363) are rated 13 A; heaters run for hours, so each stays near or
// below 80 % of that (common practice for continuous loads).
const demoPlugs: PlugRow[] = [
  plug("glass-heater", {
    houseId: glass.id,
    deviceId: "glass-heater",
    name: "Glasshouse heater",
    applianceKind: "heater",
    applianceWatts: 2000,
    ratedCurrentA: 13,
    metersEnergy: true,
    sensorId: demoSensors[0]!.id,
    failsafe: "duty",
    failsafeDutyPercent: 30,
    outsideWindows: "frost",
    frostLowC: 3,
    frostHighC: 5,
  }),
  plug("glass-fan", {
    houseId: glass.id,
    deviceId: "glass-fan",
    name: "Glasshouse circulation fan",
    applianceKind: "fan",
    applianceWatts: 60,
    ratedCurrentA: 13,
    failsafe: "off",
    minOnS: 60,
    minOffS: 60,
  }),
  plug("tunnel-heater", {
    houseId: tunnel.id,
    deviceId: "tunnel-heater",
    name: "Tunnel heater",
    applianceKind: "heater",
    applianceWatts: 2000,
    ratedCurrentA: 13,
    metersEnergy: true,
    sensorId: demoSensors[1]!.id,
    failsafe: "duty",
    failsafeDutyPercent: 25,
    outsideWindows: "frost",
    frostLowC: 2,
    frostHighC: 4,
  }),
  plug("seedling-heater", {
    houseId: seedling.id,
    deviceId: "seedling-heater",
    name: "Seedling house heater",
    applianceKind: "heater",
    applianceWatts: 2000,
    ratedCurrentA: 13,
    metersEnergy: true,
    sensorId: demoSensors[2]!.id,
    failsafe: "on",
    outsideWindows: "frost",
    frostLowC: 5,
    frostHighC: 7,
  }),
  plug("seedling-lights", {
    houseId: seedling.id,
    deviceId: "seedling-lights",
    name: "Seedling grow lights",
    applianceKind: "light",
    applianceWatts: 320,
    ratedCurrentA: 10,
    failsafe: "off",
    minOnS: 60,
    minOffS: 60,
  }),
];

const EVERY_DAY = "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU";
type WindowRow = typeof scheduleWindows.$inferInsert;
const demoSchedules: { plugKey: string; name: string; windows: Omit<WindowRow, "id" | "scheduleId">[] }[] = [
  {
    plugKey: "glass-heater",
    name: "Winter days",
    windows: [{ recurrence: EVERY_DAY, startsAt: "06:00:00", durationMin: 15 * 60, mode: "band", lowC: 8, highC: 10 }],
  },
  {
    plugKey: "glass-fan",
    name: "Midday air",
    windows: [{ recurrence: EVERY_DAY, startsAt: "10:00:00", durationMin: 6 * 60, mode: "on" }],
  },
  {
    plugKey: "tunnel-heater",
    name: "Frost-free days",
    windows: [{ recurrence: EVERY_DAY, startsAt: "05:30:00", durationMin: 14 * 60 + 30, mode: "band", lowC: 5, highC: 7 }],
  },
  {
    plugKey: "seedling-heater",
    name: "Germination",
    windows: [
      { recurrence: EVERY_DAY, startsAt: "06:00:00", durationMin: 16 * 60, mode: "band", lowC: 18, highC: 20 },
      { recurrence: EVERY_DAY, startsAt: "22:00:00", durationMin: 8 * 60, mode: "band", lowC: 15, highC: 17 },
    ],
  },
  {
    plugKey: "seedling-lights",
    name: "Fourteen-hour day",
    windows: [{ recurrence: EVERY_DAY, startsAt: "06:00:00", durationMin: 14 * 60, mode: "on" }],
  },
];

const tariffId = demoId("tariff:two-rate");

export type SeedSummary = { created: Record<string, number> };

async function insertMissing<T extends { id?: string }>(
  db: Database,
  table: Parameters<Database["insert"]>[0],
  idColumn: MySqlColumn,
  rows: T[],
): Promise<number> {
  if (rows.length === 0) return 0;
  const existing = await db
    .select({ id: idColumn })
    .from(table as never)
    .where(inArray(idColumn, rows.map((r) => r.id!)));
  const have = new Set((existing as { id: string }[]).map((r) => r.id));
  const missing = rows.filter((r) => !have.has(r.id!));
  if (missing.length) await db.insert(table).values(missing as never);
  return missing.length;
}

export async function seedDemo(db: Database): Promise<SeedSummary> {
  const created: Record<string, number> = {};
  await db.transaction(async (tx) => {
    const t = tx as unknown as Database;
    created.sites = await insertMissing(t, sites, sites.id, [{ ...DEMO_SITE, ...stamps }]);

    const existingUsers = await t
      .select({ id: user.id, email: user.email })
      .from(user)
      .where(inArray(user.email, DEMO_MEMBERS.map((m) => m.email)));
    const userIds = new Map(existingUsers.map((u) => [u.email, u.id]));
    created.users = 0;
    for (const member of DEMO_MEMBERS) {
      if (userIds.has(member.email)) continue;
      const id = demoId(`user:${member.key}`);
      await t.insert(user).values({ id, name: member.name, email: member.email, emailVerified: true, ...stamps });
      await t.insert(account).values({
        id: demoId(`account:${member.key}`),
        accountId: id,
        providerId: "credential",
        userId: id,
        password: await hashPassword(member.password),
        ...stamps,
      });
      userIds.set(member.email, id);
      created.users++;
    }
    created.memberships = await insertMissing(
      t,
      memberships,
      memberships.id,
      DEMO_MEMBERS.map((m) => ({
        id: demoId(`membership:${m.key}`),
        siteId: site,
        userId: userIds.get(m.email)!,
        role: m.role,
        ...stamps,
      })),
    );

    created.houses = await insertMissing(t, houses, houses.id, demoHouses.map((h) => ({ ...h, ...stamps })));
    created.sensors = await insertMissing(t, sensors, sensors.id, demoSensors.map((s) => ({ ...s, ...stamps })));
    created.plugs = await insertMissing(t, plugs, plugs.id, demoPlugs.map((p) => ({ ...p, ...stamps })));
    created.schedules = await insertMissing(
      t,
      schedules,
      schedules.id,
      demoSchedules.map((s) => ({
        id: demoId(`schedule:${s.plugKey}`),
        plugId: demoId(`plug:${s.plugKey}`),
        name: s.name,
        ...stamps,
      })),
    );
    created.scheduleWindows = await insertMissing(
      t,
      scheduleWindows,
      scheduleWindows.id,
      demoSchedules.flatMap((s) =>
        s.windows.map((w, i) => ({
          id: demoId(`window:${s.plugKey}:${i}`),
          scheduleId: demoId(`schedule:${s.plugKey}`),
          ...w,
          ...stamps,
        })),
      ),
    );

    // The owner's tariffs and bills are theirs to change: the demo's are added to a site
    // that has none, never put back once removed (a removed tariff could overlap a new one).
    const [hasTariff] = await t.select({ id: tariffs.id }).from(tariffs).where(eq(tariffs.siteId, site)).limit(1);
    const [hasBill] = await t.select({ id: billPeriods.id }).from(billPeriods).where(eq(billPeriods.siteId, site)).limit(1);
    created.tariffs = hasTariff ? 0 : await insertMissing(t, tariffs, tariffs.id, [
      {
        id: tariffId,
        siteId: site,
        name: "Two-rate economy",
        kind: "time_of_use" as const,
        standingChargePerDay: 0.53,
        validFrom: "2026-01-01",
        ...stamps,
      },
    ]);
    created.tariffRates = hasTariff ? 0 : await insertMissing(t, tariffRates, tariffRates.id, [
      { id: demoId("rate:night"), tariffId, label: "Night", startsAt: "00:30:00", endsAt: "07:30:00", pricePerKwh: 0.135 },
      { id: demoId("rate:day"), tariffId, label: "Day", startsAt: "07:30:00", endsAt: "00:30:00", pricePerKwh: 0.285 },
    ]);
    created.billPeriods = hasBill ? 0 : await insertMissing(t, billPeriods, billPeriods.id, [
      { id: demoId("bill:2026-q3"), siteId: site, startsOn: "2026-09-01", endsOn: "2026-11-30", label: "Autumn 2026", createdAt: SEEDED_AT },
      { id: demoId("bill:2026-q4"), siteId: site, startsOn: "2026-12-01", endsOn: "2027-02-28", label: "Winter 2026–27", createdAt: SEEDED_AT },
    ]);
  });
  return { created };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("DATABASE_URL is not set.");
    process.exit(2);
  }
  const { db, pool } = connect(url, { timeoutMs: Infinity });
  try {
    const { created } = await seedDemo(db);
    const total = Object.values(created).reduce((a, b) => a + b, 0);
    console.log(total ? `demo seeded: ${JSON.stringify(created)}` : "demo already present; nothing to add.");
  } finally {
    await pool.end();
  }
}
