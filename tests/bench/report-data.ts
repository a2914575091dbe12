// The reports benchmark's data: its own MariaDB (data in .data/mariadb-bench-reports,
// never a server that happens to be running) holding one site in Europe/London with 10
// houses and 100 plugs, and 5,000,000 switches over the year before LOAD_END.
//
// Loaded once: a marker row records what was loaded, and a rerun with the same marker
// starts the server and returns at once. Anything else (a load cut short, an older
// shape) starts again from an empty database.
//
// Each plug switches every ~10.5 minutes, on and off in turn, as a heater on a band
// does; about one switch in five falls on a whole minute shared by every plug (schedule
// edges), so timestamps tie across plugs. Causes: mostly schedule and outside-windows,
// some overrides (with a person, an override row and its reason), fail-safes and
// safety cut-outs, a few withdrawn rows and rows only observed (plug_fallback, resync).
import path from "node:path";
import { randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import { root } from "../../scripts/common";
import { startLocalDatabase, type LocalDatabase } from "../../scripts/local-server";
import { migrateDatabase } from "../../db/migrate";

export const BENCH_FOLDER = path.join(root, ".data", "mariadb-bench-reports");
export const BENCH_DATABASE = "cloche_bench_reports";

export const LOAD = {
  version: 1,
  switches: 5_000_000,
  houses: 10,
  plugsPerHouse: 10,
  /** One plug per house was retired a month before the end; their history stays. */
  retiredPerHouse: 1,
  timeZone: "Europe/London",
  end: new Date("2026-11-01T00:00:00.000Z"),
  days: 365,
} as const;

const BATCH = 5000;

export type ReportData = {
  database: LocalDatabase;
  url: string;
  siteId: string;
  slug: string;
  timeZone: string;
  houses: { id: string; name: string; plugIds: string[] }[];
  plugIds: string[];
  userIds: string[];
  start: Date;
  end: Date;
  switches: number;
  /** Whether this run loaded the rows (false: they were already there). */
  loadedNow: boolean;
  loadSeconds: number | null;
};

const markerText = () => JSON.stringify(LOAD);

type Marker = { site_id: string; detail: string };

const createMarkerTable = (pool: mysql.Pool) =>
  pool.query("CREATE TABLE IF NOT EXISTS bench_marker (site_id VARCHAR(36) NOT NULL, detail TEXT NOT NULL, loaded_at DATETIME(3) NOT NULL)");

async function readMarker(pool: mysql.Pool): Promise<Marker | null> {
  await createMarkerTable(pool);
  const [rows] = await pool.query<mysql.RowDataPacket[]>("SELECT site_id, detail FROM bench_marker LIMIT 1");
  const row = rows[0] as Marker | undefined;
  return row && row.detail === markerText() ? row : null;
}

const say = (line: string) => console.log(`[report-data] ${line}`);

/** Starts the benchmark's database and loads it unless it already holds this load. */
export async function openReportData(): Promise<ReportData> {
  let database = await startLocalDatabase({ folder: BENCH_FOLDER, port: 0, database: BENCH_DATABASE, log: () => {} });
  let pool = mysql.createPool({ uri: database.url, timezone: "Z", connectionLimit: 4, multipleStatements: false });
  let marker = await readMarker(pool).catch(() => null);
  let loadedNow = false;
  let loadSeconds: number | null = null;
  if (!marker) {
    say(`no complete load found: starting from an empty database (${LOAD.switches.toLocaleString("en")} switches)…`);
    await pool.end();
    await database.stop();
    database = await startLocalDatabase({ folder: BENCH_FOLDER, port: 0, database: BENCH_DATABASE, fresh: true, log: () => {} });
    await migrateDatabase(database.url);
    pool = mysql.createPool({ uri: database.url, timezone: "Z", connectionLimit: 4 });
    const started = performance.now();
    await load(pool);
    loadSeconds = (performance.now() - started) / 1000;
    loadedNow = true;
    marker = await readMarker(pool);
    if (!marker) throw new Error("the load finished without its marker");
  }
  const siteId = marker.site_id;
  const [siteRows] = await pool.query<mysql.RowDataPacket[]>("SELECT slug, time_zone FROM sites WHERE id = ?", [siteId]);
  const [houseRows] = await pool.query<mysql.RowDataPacket[]>("SELECT id, name FROM houses WHERE site_id = ? ORDER BY name", [siteId]);
  const [plugRows] = await pool.query<mysql.RowDataPacket[]>("SELECT id, house_id FROM plugs WHERE site_id = ? ORDER BY name", [siteId]);
  const [userRows] = await pool.query<mysql.RowDataPacket[]>("SELECT id FROM `user` ORDER BY name");
  await pool.end();
  const end = LOAD.end;
  return {
    database,
    url: database.url,
    siteId,
    slug: siteRows[0]!.slug as string,
    timeZone: siteRows[0]!.time_zone as string,
    houses: houseRows.map((h) => ({ id: h.id as string, name: h.name as string, plugIds: plugRows.filter((p) => p.house_id === h.id).map((p) => p.id as string) })),
    plugIds: plugRows.map((p) => p.id as string),
    userIds: userRows.map((u) => u.id as string),
    start: new Date(end.getTime() - LOAD.days * 86_400_000),
    end,
    switches: LOAD.switches,
    loadedNow,
    loadSeconds,
  };
}

/** A small deterministic generator, so every load holds the same log. */
function random(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const REASONS = ["Watering, heater off for a while", "Frost tonight, extra heat", "=Seedlings just pricked out", "Door open for deliveries", "Checking the thermostat"];

/** 'YYYY-MM-DD HH:MM:SS.mmm' in UTC, as a SQL literal. */
const when = (ms: number) => `'${new Date(ms).toISOString().slice(0, 23).replace("T", " ")}'`;

async function load(pool: mysql.Pool) {
  const siteId = randomUUID();
  const slug = "bench-nursery";
  await pool.query("INSERT INTO sites (id, slug, name, time_zone, currency) VALUES (?, ?, ?, ?, 'GBP')", [siteId, slug, "Bench Nursery", LOAD.timeZone]);
  const users = ["Ada Marsh", "Ben Thorne", "Cleo Reed", "Dev Patel"].map((name) => ({ id: randomUUID(), name }));
  for (const u of users) {
    await pool.query("INSERT INTO `user` (id, name, email, email_verified) VALUES (?, ?, ?, 1)", [u.id, u.name, `${u.id}@bench.example`]);
    await pool.query("INSERT INTO memberships (id, site_id, user_id, role) VALUES (?, ?, ?, 'grower')", [randomUUID(), siteId, u.id]);
  }
  const retireAt = new Date(LOAD.end.getTime() - 30 * 86_400_000);
  const plugs: { id: string; watts: number; retired: boolean }[] = [];
  for (let h = 0; h < LOAD.houses; h++) {
    const houseId = randomUUID();
    await pool.query(
      `INSERT INTO houses (id, site_id, name, kind, length_m, width_m, eave_height_m, ridge_height_m, glazing, high_limit_c)
       VALUES (?, ?, ?, 'glasshouse', 6, 4, 2, 3, 'single_glass', 32)`,
      [houseId, siteId, `House ${String(h + 1).padStart(2, "0")}`],
    );
    for (let p = 0; p < LOAD.plugsPerHouse; p++) {
      const id = randomUUID();
      const watts = [2000, 2800, 1500, 3000][p % 4]!;
      const retired = p < LOAD.retiredPerHouse;
      await pool.query(
        `INSERT INTO plugs (id, site_id, house_id, device_id, name, appliance_kind, appliance_watts, rated_current_a, failsafe, lease_s, retired_at)
         VALUES (?, ?, ?, ?, ?, 'heater', ?, 16, 'off', 900, ?)`,
        [id, siteId, houseId, `h${h + 1}-heater-${p + 1}`, `Heater ${h + 1}.${p + 1}`, watts, retired ? retireAt : null],
      );
      plugs.push({ id, watts, retired });
    }
  }

  // Retired plugs are quiet for their last 30 days; the ticks make up for them.
  const retiredCount = plugs.filter((p) => p.retired).length;
  const ticks = Math.ceil(LOAD.switches / (plugs.length - (retiredCount * 30) / LOAD.days));
  const startMs = LOAD.end.getTime() - LOAD.days * 86_400_000;
  const step = (LOAD.days * 86_400_000) / ticks;
  const rand = random(12);
  const on = plugs.map(() => false);
  let written = 0;
  let overrideRows: string[] = [];
  let values: string[] = [];
  let inFlight: Promise<unknown> = Promise.resolve();
  const flush = async () => {
    const switches = values;
    const overrides = overrideRows;
    values = [];
    overrideRows = [];
    await inFlight;
    inFlight = (async () => {
      if (overrides.length) {
        await pool.query(`INSERT INTO overrides (id, plug_id, \`on\`, starts_at, ends_at, user_id, reason, created_at) VALUES ${overrides.join(",")}`);
      }
      await pool.query(
        `INSERT INTO switch_events (plug_id, at, from_on, to_on, cause, rated_watts, reading_temp_c, reading_at, user_id, override_id, command_id, ack_at, latency_ms, withdrawn_at) VALUES ${switches.join(",")}`,
      );
    })();
  };
  let lastReport = performance.now();
  for (let tick = 0; tick < ticks && written < LOAD.switches; tick++) {
    const base = startMs + tick * step;
    // One tick in five is a schedule edge: every plug switches on the same whole minute.
    const edge = tick % 5 === 0;
    const edgeMs = Math.floor(base / 60_000) * 60_000;
    for (let p = 0; p < plugs.length && written < LOAD.switches; p++) {
      const plug = plugs[p]!;
      const at = edge ? edgeMs : Math.round(base + rand() * step * 0.6);
      if (plug.retired && at >= retireAt.getTime()) continue;
      const roll = rand();
      const cause = edge ? "schedule" : roll < 0.45 ? "default" : roll < 0.86 ? "schedule" : roll < 0.91 ? "override" : roll < 0.95 ? "failsafe" : roll < 0.96 ? "safety" : roll < 0.98 ? "plug_fallback" : "resync";
      const observed = cause === "plug_fallback" || cause === "resync";
      const withdrawn = !observed && !edge && rand() < 0.01;
      const from = on[p]!;
      const to = !from;
      if (!withdrawn) on[p] = to;
      const id = `b${tick.toString(36)}-${p}`;
      const reading = cause === "schedule" || cause === "default" || cause === "safety" ? (to ? 4 + rand() * 4 : 9 + rand() * 5).toFixed(2) : "NULL";
      const readingAt = reading === "NULL" ? "NULL" : when(at - Math.round(rand() * 30_000));
      let userId = "NULL";
      let overrideId = "NULL";
      if (cause === "override") {
        const user = users[Math.floor(rand() * users.length)]!;
        const oid = randomUUID();
        userId = `'${user.id}'`;
        overrideId = `'${oid}'`;
        const reason = REASONS[Math.floor(rand() * REASONS.length)]!;
        overrideRows.push(`('${oid}','${plug.id}',${to ? 1 : 0},${when(at)},${when(at + 3_600_000)},${userId},'${reason}',${when(at)})`);
      }
      const latency = observed || withdrawn ? null : 80 + Math.floor(rand() * 900);
      values.push(
        `('${plug.id}',${when(at)},${from ? 1 : 0},${to ? 1 : 0},'${cause}',${plug.watts},${reading},${readingAt},${userId},${overrideId},'${id}',${latency === null ? "NULL" : when(at + latency)},${latency ?? "NULL"},${withdrawn ? when(at + 2000) : "NULL"})`,
      );
      written++;
      if (values.length >= BATCH) await flush();
    }
    if (performance.now() - lastReport > 10_000) {
      lastReport = performance.now();
      say(`${written.toLocaleString("en")} switches written…`);
    }
  }
  if (values.length) await flush();
  await inFlight;
  await pool.query("ANALYZE TABLE switch_events, plugs, overrides");
  await createMarkerTable(pool);
  await pool.query("DELETE FROM bench_marker");
  await pool.query("INSERT INTO bench_marker (site_id, detail, loaded_at) VALUES (?, ?, ?)", [siteId, markerText(), new Date()]);
  say(`${written.toLocaleString("en")} switches loaded.`);
}
