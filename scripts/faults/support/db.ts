// Reads what the controller wrote, straight from MariaDB: the switch log, plug and
// sensor state, readings, alerts and the controller's heartbeat. Read-only.
import mysql from "mysql2/promise";

export type Db = mysql.Pool;

export function openDb(databaseUrl: string): Db {
  return mysql.createPool({ uri: databaseUrl, connectionLimit: 3, timezone: "Z", dateStrings: false });
}

async function rows<T>(db: Db, sql: string, values: unknown[] = []): Promise<T[]> {
  const [result] = await db.query(sql, values);
  return result as T[];
}

export type DemoSite = {
  id: string;
  slug: string;
  houses: { id: string; name: string }[];
  plugs: { id: string; name: string; deviceId: string; houseId: string; sensorId: string | null; applianceKind: string }[];
  sensors: { id: string; name: string; deviceId: string; houseId: string }[];
};

/** A site with its working houses, plugs and sensors. */
export async function loadSite(db: Db, slug = "fernhollow"): Promise<DemoSite> {
  const [site] = await rows<{ id: string; slug: string }>(db, "SELECT id, slug FROM sites WHERE slug = ?", [slug]);
  if (!site) throw new Error(`no site ${slug} in the database`);
  const houses = await rows<DemoSite["houses"][number]>(db, "SELECT id, name FROM houses WHERE site_id = ? ORDER BY name", [site.id]);
  const plugs = await rows<DemoSite["plugs"][number]>(
    db,
    "SELECT id, name, device_id AS deviceId, house_id AS houseId, sensor_id AS sensorId, appliance_kind AS applianceKind FROM plugs WHERE site_id = ? AND retired_at IS NULL ORDER BY name",
    [site.id],
  );
  const sensors = await rows<DemoSite["sensors"][number]>(
    db,
    "SELECT id, name, device_id AS deviceId, house_id AS houseId FROM sensors WHERE site_id = ? AND retired_at IS NULL ORDER BY name",
    [site.id],
  );
  return { ...site, houses, plugs, sensors };
}

/** The newest heartbeat of a running (not cleanly stopped) controller, and its process id. */
export async function controllerBeat(db: Db): Promise<{ beatAt: Date; pid: number; instanceId: string } | null> {
  const [beat] = await rows<{ beatAt: Date; pid: number; instanceId: string }>(
    db,
    "SELECT beat_at AS beatAt, pid, instance_id AS instanceId FROM controller_heartbeats WHERE stopped_at IS NULL ORDER BY beat_at DESC LIMIT 1",
  );
  return beat ?? null;
}

export async function readingsCount(db: Db, sensorId: string): Promise<number> {
  const [row] = await rows<{ n: number }>(db, "SELECT COUNT(*) AS n FROM readings WHERE sensor_id = ?", [sensorId]);
  return Number(row?.n ?? 0);
}

export type StoredReading = { id: number; at: Date; tempC: number | null };

export async function lastReadingId(db: Db): Promise<number> {
  const [row] = await rows<{ id: number | null }>(db, "SELECT MAX(id) AS id FROM readings");
  return Number(row?.id ?? 0);
}

/** A sensor's readings stored after a row id (ids only grow). */
export async function readingsAfter(db: Db, sensorId: string, afterId: number): Promise<StoredReading[]> {
  const found = await rows<{ id: number; at: Date; tempC: string | null }>(
    db,
    "SELECT id, at, temp_c AS tempC FROM readings WHERE sensor_id = ? AND id > ? ORDER BY id",
    [sensorId, afterId],
  );
  return found.map((r) => ({ id: Number(r.id), at: r.at, tempC: r.tempC === null ? null : Number(r.tempC) }));
}

export type SwitchRow = {
  id: number;
  plugId: string;
  at: Date;
  fromOn: boolean | null;
  toOn: boolean;
  cause: string;
  commandId: string;
  overrideId: string | null;
  ackAt: Date | null;
  withdrawnAt: Date | null;
  readingTempC: number | null;
};

/** The switch log of some plugs from a row id on (ids only grow). */
export async function switchesAfter(db: Db, plugIds: string[], afterId: number): Promise<SwitchRow[]> {
  if (plugIds.length === 0) return [];
  const found = await rows<Omit<SwitchRow, "readingTempC" | "fromOn" | "toOn"> & { readingTempC: string | null; fromOn: number | null; toOn: number }>(
    db,
    `SELECT id, plug_id AS plugId, at, from_on AS fromOn, to_on AS toOn, cause, command_id AS commandId, override_id AS overrideId,
            ack_at AS ackAt, withdrawn_at AS withdrawnAt, reading_temp_c AS readingTempC
       FROM switch_events WHERE plug_id IN (?) AND id > ? ORDER BY id`,
    [plugIds, afterId],
  );
  return found.map((r) => ({
    ...r,
    fromOn: r.fromOn === null ? null : Boolean(r.fromOn),
    toOn: Boolean(r.toOn),
    readingTempC: r.readingTempC === null ? null : Number(r.readingTempC),
  }));
}

export async function lastSwitchId(db: Db): Promise<number> {
  const [row] = await rows<{ id: number | null }>(db, "SELECT MAX(id) AS id FROM switch_events");
  return Number(row?.id ?? 0);
}

export type PlugStateRow = {
  plugId: string;
  on: boolean | null;
  pendingOn: boolean | null;
  guardUntil: Date | null;
  presentCause: string | null;
  reportedOn: boolean | null;
  reportedAt: Date | null;
  switchCommandId: string | null;
};

export async function plugStates(db: Db, plugIds: string[]): Promise<Map<string, PlugStateRow>> {
  if (plugIds.length === 0) return new Map();
  const found = await rows<Omit<PlugStateRow, "on" | "pendingOn" | "reportedOn"> & { on: number | null; pendingOn: number | null; reportedOn: number | null }>(
    db,
    `SELECT plug_id AS plugId, \`on\`, pending_on AS pendingOn, guard_until AS guardUntil, present_cause AS presentCause,
            reported_on AS reportedOn, reported_at AS reportedAt, switch_command_id AS switchCommandId
       FROM plug_states WHERE plug_id IN (?)`,
    [plugIds],
  );
  const bool = (v: number | null) => (v === null ? null : Boolean(v));
  return new Map(found.map((r) => [r.plugId, { ...r, on: bool(r.on), pendingOn: bool(r.pendingOn), reportedOn: bool(r.reportedOn) }]));
}

export async function openAlerts(db: Db, where: { sensorId?: string; plugId?: string; kind: string }): Promise<{ id: number; raisedAt: Date }[]> {
  const column = where.sensorId ? "sensor_id" : "plug_id";
  return rows(db, `SELECT id, raised_at AS raisedAt FROM alerts WHERE ${column} = ? AND kind = ? AND cleared_at IS NULL`, [
    where.sensorId ?? where.plugId,
    where.kind,
  ]);
}

/** Command ids that appear more than once in the given rows: a switch written twice. */
export function doubledCommands(switches: SwitchRow[]): string[] {
  const seen = new Set<string>();
  const doubled = new Set<string>();
  for (const s of switches) (seen.has(s.commandId) ? doubled : seen).add(s.commandId);
  return [...doubled];
}

/**
 * Kept switches that repeat the state the plug was already in by the log: the same
 * plug switched to the same state twice in a row, with no withdrawn row between.
 */
export function repeatedSwitches(switches: SwitchRow[]): SwitchRow[] {
  const lastKept = new Map<string, boolean>();
  const repeated: SwitchRow[] = [];
  for (const s of switches) {
    if (s.withdrawnAt) continue;
    if (lastKept.get(s.plugId) === s.toOn) repeated.push(s);
    lastKept.set(s.plugId, s.toOn);
  }
  return repeated;
}
