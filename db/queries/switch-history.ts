import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { localDayRange } from "@/lib/audit";
import type { SwitchCause } from "@/lib/domain";
import { AppError } from "@/lib/errors";
import type { SwitchFilter } from "@/lib/schemas/switch-history";
import { decodeSwitchCursor, encodeSwitchCursor, switchStatus, type SwitchCursor, type SwitchStatus } from "@/lib/switch-history";

export type SwitchHistoryRow = {
  id: number;
  at: Date;
  plugId: string;
  plugName: string;
  plugDeviceId: string;
  plugRetired: boolean;
  houseId: string;
  houseName: string;
  fromOn: boolean | null;
  toOn: boolean;
  cause: SwitchCause;
  status: SwitchStatus;
  readingTempC: number | null;
  readingAt: Date | null;
  userId: string | null;
  userName: string | null;
  reason: string | null;
  commandId: string;
  ackAt: Date | null;
  latencyMs: number | null;
  withdrawnAt: Date | null;
  ratedWatts: number | null;
};

/**
 * How a page is read, chosen per filter so that a page deep in the set costs what the
 * first one does. Each shape walks one index backwards from the cursor, in (at, id)
 * order (InnoDB's secondary indexes end with the primary key), and stops after the page:
 *
 *   plug   one plug: (plug_id, at); cause and person are checked on the rows it walks.
 *   cause  a cause (a person implies `override`): (cause, at), the site's plugs checked.
 *   merge  a house or the whole site, up to MERGE_MAX_PLUGS plugs: each plug's newest
 *          page from (plug_id, at) (index only), merged. Costs plugs × page, whatever
 *          the other sites in the table hold.
 *   time   more plugs than that, or an export's large batches: (at), the site's plugs
 *          checked. Costs page ÷ (the site's share of the log's rows).
 *
 * A time range alone cannot lead an index that starts with the plug (MariaDB 10.11 has
 * no skip scan), hence merge rather than one range over (plug_id, at).
 */
type Shape = "plug" | "cause" | "merge" | "time";

const MERGE_MAX_PLUGS = 200;

const INDEX: Record<Exclude<Shape, "merge">, SQL> = {
  plug: sql.raw("switch_events_plug_at_idx"),
  cause: sql.raw("switch_events_cause_at_idx"),
  time: sql.raw("switch_events_at_idx"),
};

type Scope = {
  plugIds: string[];
  cause?: SwitchCause;
  userId?: string;
  start?: Date;
  end?: Date;
};

function chooseShape(scope: Scope, purpose: "page" | "batch"): Shape {
  if (scope.plugIds.length === 1) return "plug";
  if (scope.cause || scope.userId) return "cause";
  return purpose === "page" && scope.plugIds.length <= MERGE_MAX_PLUGS ? "merge" : "time";
}

/** The plugs the filter covers (retired ones too: they are history). A house or plug of another site is bad input. */
async function resolveScope(siteId: string, filter: SwitchFilter, timeZone: string): Promise<Scope> {
  if (filter.houseId) {
    const [found] = await rows<{ id: string }>(sql`SELECT id FROM houses WHERE id = ${filter.houseId} AND site_id = ${siteId}`);
    if (!found) throw new AppError("bad_input", "That house is not one of this site's houses.", { houseId: "Not a house of this site" });
  }
  const plugs = await rows<{ id: string; house_id: string }>(sql`
    SELECT id, house_id FROM plugs WHERE site_id = ${siteId}
    ${filter.houseId ? sql`AND house_id = ${filter.houseId}` : sql``}
    ${filter.plugId ? sql`AND id = ${filter.plugId}` : sql``}`);
  if (filter.plugId && plugs.length === 0) {
    const field = filter.houseId ? "That plug is not in the house chosen." : "That plug is not one of this site's plugs.";
    throw new AppError("bad_input", field, { plugId: filter.houseId ? "Not a plug of this house" : "Not a plug of this site" });
  }
  const { start, end } = localDayRange(filter, timeZone);
  return { plugIds: plugs.map((p) => p.id), cause: filter.cause, userId: filter.userId, start, end };
}

async function rows<T>(query: SQL): Promise<T[]> {
  const [result] = (await getDb().execute(query)) as unknown as [T[]];
  return result;
}

const plugList = (ids: string[]) => sql.join(
  ids.map((id) => sql`${id}`),
  sql`, `,
);

/** The conditions every shape shares: dates, keyset, cause and person. `e` is the switch_events alias. */
function commonWhere(scope: Scope, cursor: SwitchCursor | null): SQL[] {
  const where: SQL[] = [];
  if (scope.start) where.push(sql`e.at >= ${scope.start}`);
  if (scope.end) where.push(sql`e.at < ${scope.end}`);
  // `at <= c` is the range the index walks; the tie on `at` is settled by id.
  if (cursor) where.push(sql`e.at <= ${cursor.at} AND (e.at < ${cursor.at} OR e.id < ${cursor.id})`);
  const cause = scope.cause ?? (scope.userId ? "override" : undefined);
  if (cause) where.push(sql`e.cause = ${cause}`);
  if (scope.userId) where.push(sql`e.user_id = ${scope.userId}`);
  return where;
}

const SELECT_ROW = sql`
  e.id, e.at, e.plug_id, p.name AS plug_name, p.device_id AS plug_device_id, p.retired_at AS plug_retired_at,
  h.id AS house_id, h.name AS house_name, e.from_on, e.to_on, e.cause, e.reading_temp_c, e.reading_at,
  e.user_id, u.name AS user_name, o.reason, e.command_id, e.ack_at, e.latency_ms, e.withdrawn_at, e.rated_watts`;

const JOINS = sql`
  JOIN plugs p ON p.id = e.plug_id
  JOIN houses h ON h.id = p.house_id
  LEFT JOIN \`user\` u ON u.id = e.user_id
  LEFT JOIN overrides o ON o.id = e.override_id`;

/** The statement for one page (or batch) of `limit` rows after `cursor`, newest first. */
export function pageQuery(scope: Scope, cursor: SwitchCursor | null, limit: number, shape: Shape): SQL {
  const where = commonWhere(scope, cursor);
  if (shape === "merge") {
    const perPlug = scope.plugIds.map(
      (plugId) => sql`(SELECT e.id, e.at FROM switch_events e FORCE INDEX (switch_events_plug_at_idx)
        WHERE ${sql.join([sql`e.plug_id = ${plugId}`, ...where], sql` AND `)}
        ORDER BY e.at DESC, e.id DESC LIMIT ${limit})`,
    );
    return sql`SELECT STRAIGHT_JOIN ${SELECT_ROW}
      FROM (${sql.join(perPlug, sql` UNION ALL `)}) k
      JOIN switch_events e ON e.id = k.id ${JOINS}
      ORDER BY k.at DESC, k.id DESC LIMIT ${limit}`;
  }
  const plugs = shape === "plug" ? sql`e.plug_id = ${scope.plugIds[0]!}` : sql`e.plug_id IN (${plugList(scope.plugIds)})`;
  return sql`SELECT STRAIGHT_JOIN ${SELECT_ROW}
    FROM switch_events e FORCE INDEX (${INDEX[shape]}) ${JOINS}
    WHERE ${sql.join([plugs, ...where], sql` AND `)}
    ORDER BY e.at DESC, e.id DESC LIMIT ${limit}`;
}

type RawRow = {
  id: number | string;
  at: Date | string;
  plug_id: string;
  plug_name: string;
  plug_device_id: string;
  plug_retired_at: Date | null;
  house_id: string;
  house_name: string;
  from_on: number | null;
  to_on: number;
  cause: SwitchCause;
  reading_temp_c: string | number | null;
  reading_at: Date | string | null;
  user_id: string | null;
  user_name: string | null;
  reason: string | null;
  command_id: string;
  ack_at: Date | string | null;
  latency_ms: number | null;
  withdrawn_at: Date | string | null;
  rated_watts: number | null;
};

/** Drizzle's mysql2 driver hands DATETIME back as UTC text ("2026-01-15 08:00:00.000"). */
function instant(value: Date | string): Date;
function instant(value: Date | string | null): Date | null;
function instant(value: Date | string | null): Date | null {
  if (value === null || value instanceof Date) return value;
  return new Date(`${value.replace(" ", "T")}Z`);
}

function toRow(r: RawRow): SwitchHistoryRow {
  const row = {
    id: Number(r.id),
    at: instant(r.at),
    plugId: r.plug_id,
    plugName: r.plug_name,
    plugDeviceId: r.plug_device_id,
    plugRetired: r.plug_retired_at !== null,
    houseId: r.house_id,
    houseName: r.house_name,
    fromOn: r.from_on === null ? null : Boolean(r.from_on),
    toOn: Boolean(r.to_on),
    cause: r.cause,
    readingTempC: r.reading_temp_c === null ? null : Number(r.reading_temp_c),
    readingAt: instant(r.reading_at),
    userId: r.user_id,
    userName: r.user_name,
    reason: r.reason,
    commandId: r.command_id,
    ackAt: instant(r.ack_at),
    latencyMs: r.latency_ms,
    withdrawnAt: instant(r.withdrawn_at),
    ratedWatts: r.rated_watts,
  };
  return { ...row, status: switchStatus(row) };
}

async function readPage(scope: Scope, cursor: SwitchCursor | null, limit: number, purpose: "page" | "batch") {
  if (scope.plugIds.length === 0) return [];
  return (await rows<RawRow>(pageQuery(scope, cursor, limit, chooseShape(scope, purpose)))).map(toRow);
}

export type SwitchHistoryPage = { rows: SwitchHistoryRow[]; nextCursor: string | null };

/**
 * One page of the site's switches, newest first, after `cursor` (keyset on (at, id)).
 * Every plug of the site counts, retired ones included.
 */
export async function getSwitchHistoryPage({
  siteId,
  timeZone,
  filter,
  cursor,
  limit,
}: {
  siteId: string;
  timeZone: string;
  filter: SwitchFilter;
  cursor?: string;
  limit: number;
}): Promise<SwitchHistoryPage> {
  const scope = await resolveScope(siteId, filter, timeZone);
  const after = cursor ? decodeSwitchCursor(cursor) : null;
  if (cursor && !after) throw new AppError("bad_input", "Cursor is not one this list gave out.", { cursor: "Not a cursor of this list" });
  const found = await readPage(scope, after, limit + 1, "page");
  const page = found.slice(0, limit);
  const last = page.at(-1);
  return { rows: page, nextCursor: found.length > limit && last ? encodeSwitchCursor(last) : null };
}

/**
 * Every switch the filter covers, newest first, in batches read by keyset: one batch
 * in memory at a time, and no connection held between batches.
 */
export async function* streamSwitchHistory({
  siteId,
  timeZone,
  filter,
  batchSize = 5000,
}: {
  siteId: string;
  timeZone: string;
  filter: SwitchFilter;
  batchSize?: number;
}): AsyncGenerator<SwitchHistoryRow[]> {
  const scope = await resolveScope(siteId, filter, timeZone);
  let cursor: SwitchCursor | null = null;
  for (;;) {
    const batch = await readPage(scope, cursor, batchSize, "batch");
    if (batch.length) yield batch;
    if (batch.length < batchSize) return;
    const last = batch.at(-1)!;
    cursor = { at: last.at, id: last.id };
  }
}

/** The filter form's choices: houses, plugs (retired ones marked) and the people who made overrides. */
export async function getSwitchHistoryChoices({ siteId }: { siteId: string }) {
  const [houses, plugs, people] = await Promise.all([
    rows<{ id: string; name: string }>(sql`SELECT id, name FROM houses WHERE site_id = ${siteId} ORDER BY name`),
    rows<{ id: string; name: string; house_id: string; retired_at: Date | null }>(
      sql`SELECT id, name, house_id, retired_at FROM plugs WHERE site_id = ${siteId} ORDER BY retired_at IS NOT NULL, name`,
    ),
    rows<{ id: string; name: string }>(sql`
      SELECT DISTINCT u.id, u.name FROM overrides o
      JOIN plugs p ON p.id = o.plug_id AND p.site_id = ${siteId}
      JOIN \`user\` u ON u.id = o.user_id
      ORDER BY u.name`),
  ]);
  return {
    houses,
    plugs: plugs.map((p) => ({ id: p.id, name: p.name, houseId: p.house_id, retired: p.retired_at !== null })),
    people,
  };
}

export type SwitchHistoryChoices = Awaited<ReturnType<typeof getSwitchHistoryChoices>>;
