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

const SWITCH_COLUMNS = "id, at, to_on, rated_watts, withdrawn_at IS NOT NULL AS withdrawn";
type SwitchRow = { id: number; at: Date; to_on: number; rated_watts: number | null; withdrawn: number };

const toSwitch = (r: SwitchRow): LoggedSwitch => ({ atMs: r.at.getTime(), toOn: Boolean(r.to_on), ratedWatts: r.rated_watts, withdrawn: Boolean(r.withdrawn) });

/** The plug's log from its last kept switch before `fromMs` to its first kept switch at or after `toMs`, in order. */
export async function switchesAround(conn: Conn | Pool, plugId: string, fromMs: number, toMs: number): Promise<LoggedSwitch[]> {
  const from = new Date(fromMs);
  const to = new Date(toMs);
  const found = await rows<SwitchRow>(
    conn,
    `(SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at < ? AND withdrawn_at IS NULL ORDER BY at DESC, id DESC LIMIT 1)
     UNION ALL (SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at >= ? AND at < ?)
     UNION ALL (SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? AND at >= ? AND withdrawn_at IS NULL ORDER BY at, id LIMIT 1)`,
    [plugId, from, plugId, from, to, plugId, to],
  );
  return found.sort((a, b) => a.at.getTime() - b.at.getTime() || a.id - b.id).map(toSwitch);
}

/** The plug's meter samples from the last before `fromMs` to the first at or after `toMs`. */
export async function samplesAround(conn: Conn | Pool, plugId: string, fromMs: number, toMs: number): Promise<MeterSample[]> {
  const from = new Date(fromMs);
  const to = new Date(toMs);
  const found = await rows<{ at: Date; watt_hours: number }>(
    conn,
    `(SELECT at, watt_hours FROM meter_samples WHERE plug_id = ? AND at < ? ORDER BY at DESC LIMIT 1)
     UNION ALL (SELECT at, watt_hours FROM meter_samples WHERE plug_id = ? AND at >= ? AND at < ?)
     UNION ALL (SELECT at, watt_hours FROM meter_samples WHERE plug_id = ? AND at >= ? ORDER BY at LIMIT 1)`,
    [plugId, from, plugId, from, to, plugId, to],
  );
  return found.map((r) => ({ atMs: r.at.getTime(), wattHours: Number(r.watt_hours) })).sort((a, b) => a.atMs - b.atMs);
}

const INSERT_CHUNK = 2000;

async function writeCells(conn: Conn, plugId: string, fromDay: string, toDay: string, cells: readonly EnergyCell[]) {
  await conn.query("DELETE FROM energy_days WHERE plug_id = ? AND day BETWEEN ? AND ?", [plugId, fromDay, toDay]);
  for (let i = 0; i < cells.length; i += INSERT_CHUNK) {
    const chunk = cells.slice(i, i + INSERT_CHUNK).map((c) => [plugId, c.day, c.rateKey, c.onMs, c.ratedWattMs, c.meteredWs]);
    await conn.query("INSERT INTO energy_days (plug_id, day, rate_key, on_ms, rated_watt_ms, metered_ws) VALUES ?", [chunk]);
  }
}

/** Runs `work` holding the plug's roll-up lock on one connection of its own. */
async function withPlugLock<T>(pool: Pool, plugId: string, work: (conn: Conn) => Promise<T>): Promise<T> {
  const conn = await pool.getConnection();
  const name = `cloche-energy-${plugId}`;
  try {
    const [[got]] = (await conn.query("SELECT GET_LOCK(?, 60) AS got", [name])) as unknown as [{ got: number | null }[]];
    if (got?.got !== 1) throw new Error(`the energy roll-up of plug ${plugId} is busy (lock not granted in 60 s)`);
    try {
      return await work(conn);
    } finally {
      await conn.query("SELECT RELEASE_LOCK(?)", [name]);
    }
  } finally {
    conn.release();
  }
}

/** Makes the plug's days from `fromDay` to `toDay` again from its log; returns the cells written. */
async function rewriteDays(pool: Pool, plug: PlugInfo, tariffsOf: (conn: Conn) => Promise<Tariff[]>, range: (conn: Conn) => Promise<[string, string]>) {
  return withPlugLock(pool, plug.id, async (conn) => {
    await conn.query("START TRANSACTION");
    try {
      const [fromDay, toDay] = await range(conn);
      const startMs = dayStartMs(fromDay, plug.zone);
      const endMs = dayStartMs(nextDay(toDay), plug.zone);
      const [tariffs, log, samples] = await Promise.all([
        tariffsOf(conn),
        switchesAround(conn, plug.id, startMs, endMs),
        plug.metersEnergy ? samplesAround(conn, plug.id, startMs, endMs) : Promise.resolve(null),
      ]);
      const cells = rollupCells(plug, buildSlices({ zone: plug.zone, fromDay, toDay, tariffs }), log, samples);
      await writeCells(conn, plug.id, fromDay, toDay, cells);
      await conn.query("COMMIT");
      return cells.length;
    } catch (error) {
      await conn.query("ROLLBACK").catch(() => undefined);
      throw error;
    }
  });
}

async function firstAt(conn: Conn, sql: string, values: unknown[]): Promise<number | null> {
  const [found] = await rows<{ at: Date }>(conn, sql, values);
  return found ? found.at.getTime() : null;
}

/**
 * Brings the roll-up up to date with changes to these plugs' logs and meters. The days
 * made again run from the start of the interval (or meter piece) each change falls in
 * to the end of the next one, so a switch that closes an interval begun days ago, or
 * one written out of order, is counted where it belongs.
 */
export async function refreshEnergyDays(db: Database, changes: readonly EnergyChange[]): Promise<void> {
  const byPlug = new Map<string, { fromMs: number; toMs: number }>();
  for (const c of changes) {
    const seen = byPlug.get(c.plugId);
    byPlug.set(c.plugId, seen ? { fromMs: Math.min(seen.fromMs, c.fromMs), toMs: Math.max(seen.toMs, c.toMs) } : { fromMs: c.fromMs, toMs: c.toMs });
  }
  const pool = poolOf(db);
  for (const plug of await plugsByIds(pool, [...byPlug.keys()])) {
    const { fromMs, toMs } = byPlug.get(plug.id)!;
    await rewriteDays(
      pool,
      plug,
      (conn) => loadTariffs(conn, plug.siteId),
      async (conn) => {
        const from = new Date(fromMs);
        const to = new Date(toMs);
        const edges = await Promise.all([
          firstAt(conn, "SELECT at FROM switch_events WHERE plug_id = ? AND at < ? AND withdrawn_at IS NULL ORDER BY at DESC LIMIT 1", [plug.id, from]),
          firstAt(conn, "SELECT at FROM switch_events WHERE plug_id = ? AND at > ? AND withdrawn_at IS NULL ORDER BY at LIMIT 1", [plug.id, to]),
          plug.metersEnergy ? firstAt(conn, "SELECT at FROM meter_samples WHERE plug_id = ? AND at < ? ORDER BY at DESC LIMIT 1", [plug.id, from]) : null,
          plug.metersEnergy ? firstAt(conn, "SELECT at FROM meter_samples WHERE plug_id = ? AND at > ? ORDER BY at LIMIT 1", [plug.id, to]) : null,
        ]);
        const [prevSwitchMs, nextSwitchMs, prevSampleMs, nextSampleMs] = edges;
        return daysToRefresh(plug.zone, { fromMs, toMs }, { prevSwitchMs, nextSwitchMs, prevSampleMs, nextSampleMs });
      },
    );
  }
}

/** Makes the roll-up of a site's plugs again for these local days (after its tariffs changed). */
export async function refreshSiteEnergyDays(db: Database, { siteId, fromDay, toDay }: { siteId: string; fromDay: string; toDay: string }): Promise<void> {
  const pool = poolOf(db);
  const ids = await rows<{ id: string }>(pool, "SELECT id FROM plugs WHERE site_id = ?", [siteId]);
  for (const plug of await plugsByIds(pool, ids.map((p) => p.id))) {
    await rewriteDays(
      pool,
      plug,
      (conn) => loadTariffs(conn, siteId),
      async () => [fromDay, toDay],
    );
  }
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

/**
 * Makes the whole roll-up of these sites (all when none named) again from the log: each
 * plug's days from its first switch or sample to its last. Returns what it read and wrote.
 */
export async function rebuildEnergyDays(
  db: Database,
  { siteIds, onProgress }: { siteIds?: string[]; onProgress?: (p: RebuildProgress) => void } = {},
): Promise<RebuildProgress> {
  const pool = poolOf(db);
  const ids = await rows<{ id: string }>(pool, siteIds?.length ? "SELECT id FROM plugs WHERE site_id IN (?)" : "SELECT id FROM plugs", siteIds?.length ? [siteIds] : []);
  const plugList = await plugsByIds(pool, ids.map((p) => p.id));
  const progress: RebuildProgress = { plugs: 0, of: plugList.length, switches: 0, cells: 0 };
  const tariffCache = new Map<string, Promise<Tariff[]>>();
  const sliceCache = new Map<string, Slice[]>();
  for (const plug of plugList) {
    await withPlugLock(pool, plug.id, async (conn) => {
      await conn.query("START TRANSACTION");
      try {
        if (!tariffCache.has(plug.siteId)) tariffCache.set(plug.siteId, loadTariffs(conn, plug.siteId));
        const tariffs = await tariffCache.get(plug.siteId)!;
        const log = (await rows<SwitchRow>(conn, `SELECT ${SWITCH_COLUMNS} FROM switch_events WHERE plug_id = ? ORDER BY at, id`, [plug.id])).map(toSwitch);
        const samples = plug.metersEnergy
          ? (await rows<{ at: Date; watt_hours: number }>(conn, "SELECT at, watt_hours FROM meter_samples WHERE plug_id = ? ORDER BY at", [plug.id])).map((r) => ({
              atMs: r.at.getTime(),
              wattHours: Number(r.watt_hours),
            }))
          : null;
        await conn.query("DELETE FROM energy_days WHERE plug_id = ?", [plug.id]);
        const ends = [log[0]?.atMs, log.at(-1)?.atMs, samples?.[0]?.atMs, samples?.at(-1)?.atMs].filter((t): t is number => t !== undefined);
        if (ends.length) {
          const fromDay = dayOf(Math.min(...ends), plug.zone);
          const toDay = dayOf(Math.max(...ends), plug.zone);
          // Plugs of a site mostly share their first and last days: slices are made once.
          const sliceKey = `${plug.siteId}|${fromDay}|${toDay}`;
          let slices = sliceCache.get(sliceKey);
          if (!slices) sliceCache.set(sliceKey, (slices = buildSlices({ zone: plug.zone, fromDay, toDay, tariffs })));
          const cells = rollupCells(plug, slices, log, samples);
          await writeCells(conn, plug.id, fromDay, toDay, cells);
          progress.cells += cells.length;
        }
        progress.switches += log.length;
        await conn.query("COMMIT");
      } catch (error) {
        await conn.query("ROLLBACK").catch(() => undefined);
        throw error;
      }
    });
    progress.plugs++;
    onProgress?.(progress);
  }
  return progress;
}
