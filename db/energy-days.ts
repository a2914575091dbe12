// Keeps the energy roll-up (energy_days): each plug's runtime and energy per local day
// and tariff rate, from the switch log's closed on-intervals and the meter's samples.
// A plug's days are always made again whole from the log, never added to, so running a
// refresh twice, or two at once, cannot count anything twice: each plug's refresh
// holds a named lock for that plug, and reads the log only once it has it.
//
// The controller refreshes the days its switches, withdrawals and meter samples touch;
// the web app refreshes a site's days when its tariffs change; `npm run energy:rebuild`
// makes everything again from the log.
import type mysql from "mysql2/promise";
import type { Connection as CoreConnection } from "mysql2";
import type { Database } from "@/db/client";
import { buildSlices, dayOf, dayStartMs, nextDay, type Slice } from "@/lib/energy/calendar";
import { rollupCells, type EnergyCell, type LoggedSwitch, type MeterSample } from "@/lib/energy/runtime";
import { daysToRefresh } from "@/lib/energy/refresh";
import { WEEKDAY_CODES, type Tariff, type WeekdayCode } from "@/lib/energy/tariff";

type Pool = mysql.Pool;
type Conn = mysql.PoolConnection;

/** Something changed in a plug's log or meter between these instants. */
export type EnergyChange = { plugId: string; fromMs: number; toMs: number };

type PlugInfo = { id: string; siteId: string; zone: string; applianceWatts: number; metersEnergy: boolean };

const poolOf = (db: Database) => (db as unknown as { $client: Pool }).$client;

async function rows<T>(conn: Conn | Pool, sql: string, values: unknown[]): Promise<T[]> {
  const [result] = await conn.query(sql, values);
  return result as T[];
}

async function plugsByIds(conn: Conn | Pool, plugIds: string[]): Promise<PlugInfo[]> {
  if (plugIds.length === 0) return [];
  const found = await rows<{ id: string; site_id: string; time_zone: string; appliance_watts: number; meters_energy: number }>(
    conn,
    "SELECT p.id, p.site_id, s.time_zone, p.appliance_watts, p.meters_energy FROM plugs p JOIN sites s ON s.id = p.site_id WHERE p.id IN (?)",
    [plugIds],
  );
  return found.map((p) => ({ id: p.id, siteId: p.site_id, zone: p.time_zone, applianceWatts: p.appliance_watts, metersEnergy: Boolean(p.meters_energy) }));
}

/** A site's tariffs with their rates, as lib/energy takes them. */
export async function loadTariffs(conn: Conn | Pool, siteId: string): Promise<Tariff[]> {
  const tariffRows = await rows<{
    id: string;
    name: string;
    kind: "flat" | "time_of_use";
    valid_from: string;
    valid_until: string | null;
    standing_charge_per_day: string;
    tax_percent: string;
  }>(
    conn,
    "SELECT id, name, kind, DATE_FORMAT(valid_from, '%Y-%m-%d') AS valid_from, DATE_FORMAT(valid_until, '%Y-%m-%d') AS valid_until, standing_charge_per_day, tax_percent FROM tariffs WHERE site_id = ? ORDER BY valid_from",
    [siteId],
  );
  if (tariffRows.length === 0) return [];
  const rateRows = await rows<{ id: string; tariff_id: string; label: string; starts_at: string; ends_at: string; days: string; price_per_kwh: string }>(
    conn,
    "SELECT id, tariff_id, label, starts_at, ends_at, days, price_per_kwh FROM tariff_rates WHERE tariff_id IN (?) ORDER BY starts_at, id",
    [tariffRows.map((t) => t.id)],
  );
  return tariffRows.map((t) => ({
    id: t.id,
    name: t.name,
    kind: t.kind,
    validFrom: t.valid_from,
    validUntil: t.valid_until,
    standingChargePerDay: Number(t.standing_charge_per_day),
    taxPercent: Number(t.tax_percent),
    rates: rateRows
      .filter((r) => r.tariff_id === t.id)
      .map((r) => ({
        id: r.id,
        label: r.label,
        startsAt: r.starts_at,
        endsAt: r.ends_at,
        days: r.days.split(",").filter((d): d is WeekdayCode => (WEEKDAY_CODES as readonly string[]).includes(d)),
        pricePerKwh: Number(r.price_per_kwh),
      })),
  }));
}

const SWITCH_COLUMNS = "plug_id, id, at, to_on, rated_watts, withdrawn_at IS NOT NULL AS withdrawn";
type SwitchRow = { plug_id: string; id: number; at: Date; to_on: number; rated_watts: number | null; withdrawn: number };

const toSwitch = (r: SwitchRow): LoggedSwitch => ({ atMs: r.at.getTime(), toOn: Boolean(r.to_on), ratedWatts: r.rated_watts, withdrawn: Boolean(r.withdrawn) });

type Span = { plugId: string; fromMs: number; toMs: number };

function byPlug<T extends { plug_id: string }>(found: T[]): Map<string, T[]> {
  const grouped = new Map<string, T[]>();
  for (const r of found) {
    const list = grouped.get(r.plug_id);
    if (list) list.push(r);
    else grouped.set(r.plug_id, [r]);
  }
  return grouped;
}

/**
 * Each plug's log from its last kept switch before `fromMs` to its first kept switch at
 * or after `toMs`, in order: one statement for all the spans.
 */
export async function switchesAround(conn: Conn | Pool, spans: readonly Span[]): Promise<Map<string, LoggedSwitch[]>> {
  if (spans.length === 0) return new Map();
  const sql = spans
    .map(
      () => `(SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at < ? AND withdrawn_at IS NULL ORDER BY at DESC, id DESC LIMIT 1)
     UNION ALL (SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at >= ? AND at < ?)
     UNION ALL (SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at >= ? AND withdrawn_at IS NULL ORDER BY at, id LIMIT 1)`,
    )
    .join(" UNION ALL ");
  const values = spans.flatMap(({ plugId, fromMs, toMs }) => [plugId, new Date(fromMs), plugId, new Date(fromMs), new Date(toMs), plugId, new Date(toMs)]);
  const grouped = byPlug(await rows<SwitchRow>(conn, sql, values));
  return new Map(spans.map(({ plugId }) => [plugId, (grouped.get(plugId) ?? []).sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id).map(toSwitch)]));
}

/** Each plug's meter samples from the last before `fromMs` to the first at or after `toMs`. */
export async function samplesAround(conn: Conn | Pool, spans: readonly Span[]): Promise<Map<string, MeterSample[]>> {
  if (spans.length === 0) return new Map();
  const sql = spans
    .map(
      () => `(SELECT plug_id, at, watt_hours FROM meter_samples WHERE plug_id = ? AND at < ? ORDER BY at DESC LIMIT 1)
     UNION ALL (SELECT plug_id, at, watt_hours FROM meter_samples WHERE plug_id = ? AND at >= ? AND at < ?)
     UNION ALL (SELECT plug_id, at, watt_hours FROM meter_samples WHERE plug_id = ? AND at >= ? ORDER BY at LIMIT 1)`,
    )
    .join(" UNION ALL ");
  const values = spans.flatMap(({ plugId, fromMs, toMs }) => [plugId, new Date(fromMs), plugId, new Date(fromMs), new Date(toMs), plugId, new Date(toMs)]);
  const grouped = byPlug(await rows<{ plug_id: string; at: Date; watt_hours: number }>(conn, sql, values));
  return new Map(
    spans.map(({ plugId }) => [plugId, (grouped.get(plugId) ?? []).map((r) => ({ atMs: r.at.getTime(), wattHours: Number(r.watt_hours) })).sort((a, b) => a.atMs - b.atMs)]),
  );
}

/** Around each change: the plug's kept switches (and samples) just before and just after it. */
async function edgesAround(conn: Conn, plugs: readonly PlugInfo[], spans: Map<string, { fromMs: number; toMs: number }>) {
  const parts: string[] = [];
  const values: unknown[] = [];
  for (const plug of plugs) {
    const { fromMs, toMs } = spans.get(plug.id)!;
    const [from, to] = [new Date(fromMs), new Date(toMs)];
    parts.push(
      "(SELECT plug_id, 'prevSwitchMs' AS edge, at FROM switch_events WHERE plug_id = ? AND at < ? AND withdrawn_at IS NULL ORDER BY at DESC LIMIT 1)",
      "(SELECT plug_id, 'nextSwitchMs' AS edge, at FROM switch_events WHERE plug_id = ? AND at > ? AND withdrawn_at IS NULL ORDER BY at LIMIT 1)",
    );
    values.push(plug.id, from, plug.id, to);
    if (plug.metersEnergy) {
      parts.push(
        "(SELECT plug_id, 'prevSampleMs' AS edge, at FROM meter_samples WHERE plug_id = ? AND at < ? ORDER BY at DESC LIMIT 1)",
        "(SELECT plug_id, 'nextSampleMs' AS edge, at FROM meter_samples WHERE plug_id = ? AND at > ? ORDER BY at LIMIT 1)",
      );
      values.push(plug.id, from, plug.id, to);
    }
  }
  type Edge = "prevSwitchMs" | "nextSwitchMs" | "prevSampleMs" | "nextSampleMs";
  const found = await rows<{ plug_id: string; edge: Edge; at: Date }>(conn, parts.join(" UNION ALL "), values);
  const around = new Map(plugs.map((p) => [p.id, { prevSwitchMs: null, nextSwitchMs: null, prevSampleMs: null, nextSampleMs: null } as Record<Edge, number | null>]));
  for (const r of found) around.get(r.plug_id)![r.edge] = r.at.getTime();
  return around;
}

const INSERT_CHUNK = 2000;

async function writeCells(conn: Conn, written: { plugId: string; fromDay: string; toDay: string; cells: readonly EnergyCell[] }[]) {
  if (written.length === 0) return;
  await conn.query(
    `DELETE FROM energy_days WHERE ${written.map(() => "(plug_id = ? AND day BETWEEN ? AND ?)").join(" OR ")}`,
    written.flatMap((w) => [w.plugId, w.fromDay, w.toDay]),
  );
  const all = written.flatMap((w) => w.cells.map((c) => [w.plugId, c.day, c.rateKey, c.onMs, c.ratedWattMs, c.meteredWs]));
  for (let i = 0; i < all.length; i += INSERT_CHUNK) {
    await conn.query("INSERT INTO energy_days (plug_id, day, rate_key, on_ms, rated_watt_ms, metered_ws) VALUES ?", [all.slice(i, i + INSERT_CHUNK)]);
  }
}

/**
 * Runs `work` in a transaction on a connection of its own, holding the roll-up locks of
 * these plugs (taken in one order, so two batches cannot wait on each other forever).
 */
async function withPlugLocks<T>(pool: Pool, plugIds: readonly string[], work: (conn: Conn) => Promise<T>): Promise<T> {
  const conn = await pool.getConnection();
  const names = [...plugIds].sort().map((id) => `cloche-energy-${id}`);
  try {
    const [[got]] = (await conn.query(`SELECT ${names.map(() => "GET_LOCK(?, 60)").join(" + ")} AS got`, names)) as unknown as [{ got: number | null }[]];
    try {
      if (Number(got?.got) !== names.length) throw new Error(`the energy roll-up of ${names.length} plugs is busy (locks not granted in 60 s)`);
      await conn.query("START TRANSACTION");
      try {
        const result = await work(conn);
        await conn.query("COMMIT");
        return result;
      } catch (error) {
        await conn.query("ROLLBACK").catch(() => undefined);
        throw error;
      }
    } finally {
      await conn.query("SELECT RELEASE_ALL_LOCKS()");
    }
  } finally {
    conn.release();
  }
}

/** Plugs per statement batch: each batch is a handful of statements whatever its size. */
const BATCH = 50;

/**
 * Makes these plugs' days again from their logs, a batch of plugs of one site at a
 * time; `daysOf` says which days of each plug, asked once the locks are held.
 */
async function rewriteDays(pool: Pool, plugs: readonly PlugInfo[], daysOf: (conn: Conn, batch: readonly PlugInfo[]) => Promise<Map<string, [string, string]>>) {
  let cells = 0;
  const bySite = new Map<string, PlugInfo[]>();
  for (const p of plugs) bySite.set(p.siteId, [...(bySite.get(p.siteId) ?? []), p]);
  for (const [siteId, sitePlugs] of bySite) {
    for (let i = 0; i < sitePlugs.length; i += BATCH) {
      const batch = sitePlugs.slice(i, i + BATCH);
      cells += await withPlugLocks(pool, batch.map((p) => p.id), async (conn) => {
        const [tariffs, days] = await Promise.all([loadTariffs(conn, siteId), daysOf(conn, batch)]);
        const spans = batch.map((p) => {
          const [fromDay, toDay] = days.get(p.id)!;
          return { plugId: p.id, fromMs: dayStartMs(fromDay, p.zone), toMs: dayStartMs(nextDay(toDay), p.zone) };
        });
        const [logs, samples] = await Promise.all([switchesAround(conn, spans), samplesAround(conn, spans.filter((s, k) => batch[k]!.metersEnergy))]);
        const written = batch.map((plug) => {
          const [fromDay, toDay] = days.get(plug.id)!;
          const slices = buildSlices({ zone: plug.zone, fromDay, toDay, tariffs });
          return { plugId: plug.id, fromDay, toDay, cells: rollupCells(plug, slices, logs.get(plug.id) ?? [], samples.get(plug.id) ?? null) };
        });
        await writeCells(conn, written);
        return written.reduce((n, w) => n + w.cells.length, 0);
      });
    }
  }
  return cells;
}

/**
 * Brings the roll-up up to date with changes to these plugs' logs and meters. The days
 * made again run from the start of the interval (or meter piece) each change falls in
 * to the end of the next one, so a switch that closes an interval begun days ago, or
 * one written out of order, is counted where it belongs.
 */
export async function refreshEnergyDays(db: Database, changes: readonly EnergyChange[]): Promise<void> {
  const spans = new Map<string, { fromMs: number; toMs: number }>();
  for (const c of changes) {
    const seen = spans.get(c.plugId);
    spans.set(c.plugId, seen ? { fromMs: Math.min(seen.fromMs, c.fromMs), toMs: Math.max(seen.toMs, c.toMs) } : { fromMs: c.fromMs, toMs: c.toMs });
  }
  const pool = poolOf(db);
  await rewriteDays(pool, await plugsByIds(pool, [...spans.keys()]), async (conn, batch) => {
    const around = await edgesAround(conn, batch, spans);
    return new Map(batch.map((p) => [p.id, daysToRefresh(p.zone, spans.get(p.id)!, around.get(p.id)!)]));
  });
}

/** Makes the roll-up of a site's plugs again for these local days (after its tariffs changed). */
export async function refreshSiteEnergyDays(db: Database, { siteId, fromDay, toDay }: { siteId: string; fromDay: string; toDay: string }): Promise<void> {
  const pool = poolOf(db);
  const ids = await rows<{ id: string }>(pool, "SELECT id FROM plugs WHERE site_id = ?", [siteId]);
  await rewriteDays(pool, await plugsByIds(pool, ids.map((p) => p.id)), async (_conn, batch) => new Map(batch.map((p) => [p.id, [fromDay, toDay] as [string, string]])));
}

/** True when the log has switches and the roll-up has no rows at all (a database from before it). */
export async function energyRollupMissing(db: Database): Promise<boolean> {
  const [found] = await rows<{ log: number; rolled: number }>(
    poolOf(db),
    "SELECT EXISTS (SELECT 1 FROM switch_events) AS log, EXISTS (SELECT 1 FROM energy_days) AS rolled",
    [],
  );
  return Boolean(found?.log) && !found?.rolled;
}

export type RebuildProgress = { plugs: number; of: number; switches: number; cells: number };

/** A plug's log as compact columns while a whole site's log is read. */
type LogColumns = { atMs: number[]; id: number[]; flags: number[]; watts: (number | null)[] };

const TO_ON = 1;
const WITHDRAWN = 2;

/**
 * The logs of these plugs, each in time order. A site that holds much of the table is
 * read in one pass in primary-key order (sequential reads); a small one through the
 * (plug_id, at) index. Rows stream in and are kept as columns, not objects.
 */
async function readLogs(conn: Conn, plugIds: readonly string[]): Promise<Map<string, LoggedSwitch[]>> {
  const columns = new Map<string, LogColumns>(plugIds.map((id) => [id, { atMs: [], id: [], flags: [], watts: [] }]));
  const [[mine]] = (await conn.query("SELECT COUNT(*) AS n FROM switch_events WHERE plug_id IN (?)", [plugIds])) as unknown as [{ n: number }[]];
  const [[table]] = (await conn.query("SELECT COALESCE(MAX(TABLE_ROWS), 0) AS n FROM information_schema.TABLES WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = 'switch_events'")) as unknown as [
    { n: number }[],
  ];
  const scan = Number(mine?.n) > 0.1 * Number(table?.n);
  const sql = `SELECT plug_id, id, TIMESTAMPDIFF(MICROSECOND, '1970-01-01 00:00:00', at) DIV 1000, to_on, rated_watts, withdrawn_at IS NOT NULL
                 FROM switch_events ${scan ? "FORCE INDEX (PRIMARY)" : ""} WHERE plug_id IN (?)`;
  const core = conn.connection as unknown as CoreConnection;
  const stream = core.query({ sql, values: [plugIds], rowsAsArray: true }).stream();
  for await (const row of stream as AsyncIterable<[string, number, number, number, number | null, number]>) {
    const c = columns.get(row[0])!;
    c.id.push(Number(row[1]));
    c.atMs.push(Number(row[2]));
    c.flags.push((row[3] ? TO_ON : 0) | (row[5] ? WITHDRAWN : 0));
    c.watts.push(row[4]);
  }
  const logs = new Map<string, LoggedSwitch[]>();
  for (const [plugId, c] of columns) {
    const order = c.atMs.map((_, i) => i).sort((a, b) => c.atMs[a]! - c.atMs[b]! || c.id[a]! - c.id[b]!);
    logs.set(
      plugId,
      order.map((i) => ({ atMs: c.atMs[i]!, toOn: (c.flags[i]! & TO_ON) !== 0, ratedWatts: c.watts[i]!, withdrawn: (c.flags[i]! & WITHDRAWN) !== 0 })),
    );
    columns.delete(plugId);
  }
  return logs;
}

/**
 * Makes the whole roll-up of these sites (all when none named) again from the log, one
 * site at a time with every one of its plugs' locks held: each plug's days from its
 * first switch or sample to its last. Returns what it read and wrote.
 */
export async function rebuildEnergyDays(
  db: Database,
  { siteIds, onProgress }: { siteIds?: string[]; onProgress?: (p: RebuildProgress) => void } = {},
): Promise<RebuildProgress> {
  const pool = poolOf(db);
  const ids = await rows<{ id: string }>(pool, siteIds?.length ? "SELECT id FROM plugs WHERE site_id IN (?)" : "SELECT id FROM plugs", siteIds?.length ? [siteIds] : []);
  const plugList = await plugsByIds(pool, ids.map((p) => p.id));
  const progress: RebuildProgress = { plugs: 0, of: plugList.length, switches: 0, cells: 0 };
  const bySite = new Map<string, PlugInfo[]>();
  for (const p of plugList) bySite.set(p.siteId, [...(bySite.get(p.siteId) ?? []), p]);
  for (const [siteId, sitePlugs] of bySite) {
    const plugIds = sitePlugs.map((p) => p.id);
    await withPlugLocks(pool, plugIds, async (conn) => {
      const tariffs = await loadTariffs(conn, siteId);
      const logs = await readLogs(conn, plugIds);
      const metering = sitePlugs.filter((p) => p.metersEnergy).map((p) => p.id);
      const samples = new Map<string, MeterSample[]>();
      if (metering.length) {
        for (const r of await rows<{ plug_id: string; at: Date; watt_hours: number }>(conn, "SELECT plug_id, at, watt_hours FROM meter_samples WHERE plug_id IN (?) ORDER BY plug_id, at", [metering])) {
          samples.set(r.plug_id, [...(samples.get(r.plug_id) ?? []), { atMs: r.at.getTime(), wattHours: Number(r.watt_hours) }]);
        }
      }
      await conn.query("DELETE FROM energy_days WHERE plug_id IN (?)", [plugIds]);
      // Plugs of a site mostly share their first and last days: slices are made once.
      const sliceCache = new Map<string, Slice[]>();
      for (const plug of sitePlugs) {
        const log = logs.get(plug.id) ?? [];
        const plugSamples = plug.metersEnergy ? (samples.get(plug.id) ?? []) : null;
        const ends = [log[0]?.atMs, log.at(-1)?.atMs, plugSamples?.[0]?.atMs, plugSamples?.at(-1)?.atMs].filter((t): t is number => t !== undefined);
        if (ends.length) {
          const fromDay = dayOf(Math.min(...ends), plug.zone);
          const toDay = dayOf(Math.max(...ends), plug.zone);
          const key = `${fromDay}|${toDay}`;
          let slices = sliceCache.get(key);
          if (!slices) sliceCache.set(key, (slices = buildSlices({ zone: plug.zone, fromDay, toDay, tariffs })));
          const cells = rollupCells(plug, slices, log, plugSamples);
          const all = cells.map((c) => [plug.id, c.day, c.rateKey, c.onMs, c.ratedWattMs, c.meteredWs]);
          for (let i = 0; i < all.length; i += INSERT_CHUNK) {
            await conn.query("INSERT INTO energy_days (plug_id, day, rate_key, on_ms, rated_watt_ms, metered_ws) VALUES ?", [all.slice(i, i + INSERT_CHUNK)]);
          }
          progress.cells += cells.length;
        }
        logs.delete(plug.id);
        progress.switches += log.length;
        progress.plugs++;
        onProgress?.(progress);
      }
    });
  }
  return progress;
}
