import "server-only";
import type { Connection as CoreConnection } from "mysql2";
import { getPool } from "@/db/client";
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
 *   time   more plugs than that, or an export (one read of every row): (at), the
 *          site's plugs checked. Costs page ÷ (the site's share of the log's rows).
 *
 * A time range alone cannot lead an index that starts with the plug (MariaDB 10.11 has
 * no skip scan), hence merge rather than one range over (plug_id, at).
 */
type Shape = "plug" | "cause" | "merge" | "time";

const MERGE_MAX_PLUGS = 200;

type ScopePlug = { id: string; name: string; deviceId: string; retired: boolean; houseId: string; houseName: string };

type Scope = {
  plugs: Map<string, ScopePlug>;
  plugIds: string[];
  cause?: SwitchCause;
  userId?: string;
  start?: Date;
  end?: Date;
};

/** The shape of one read of every row the filter covers (an export): one index walked. */
function streamShape(scope: Scope): Exclude<Shape, "merge"> {
  if (scope.plugIds.length === 1) return "plug";
  if (scope.cause || scope.userId) return "cause";
  return "time";
}

function pageShape(scope: Scope): Shape {
  const shape = streamShape(scope);
  return shape === "time" && scope.plugIds.length <= MERGE_MAX_PLUGS ? "merge" : shape;
}

/**
 * The statements here run on mysql2 directly: Drizzle's driver converts every field of
 * every row through a JavaScript callback, which made an export's reads three times
 * slower. Values are always placeholders.
 */
async function rows<T>(statement: string, values: unknown[] = []): Promise<T[]> {
  const [result] = await getPool().query({ sql: statement, values });
  return result as T[];
}

/** The plugs the filter covers (retired ones too: they are history). A house or plug of another site is bad input. */
async function resolveScope(siteId: string, filter: SwitchFilter, timeZone: string): Promise<Scope> {
  if (filter.houseId) {
    const [found] = await rows<{ id: string }>("SELECT id FROM houses WHERE id = ? AND site_id = ?", [filter.houseId, siteId]);
    if (!found) throw new AppError("bad_input", "That house is not one of this site's houses.", { houseId: "Not a house of this site" });
  }
  const found = await rows<{ id: string; name: string; device_id: string; retired_at: Date | null; house_id: string; house_name: string }>(
    `SELECT p.id, p.name, p.device_id, p.retired_at, p.house_id, h.name AS house_name
     FROM plugs p JOIN houses h ON h.id = p.house_id
     WHERE p.site_id = ?${filter.houseId ? " AND p.house_id = ?" : ""}${filter.plugId ? " AND p.id = ?" : ""}`,
    [siteId, ...(filter.houseId ? [filter.houseId] : []), ...(filter.plugId ? [filter.plugId] : [])],
  );
  if (filter.plugId && found.length === 0) {
    const message = filter.houseId ? "That plug is not in the house chosen." : "That plug is not one of this site's plugs.";
    throw new AppError("bad_input", message, { plugId: filter.houseId ? "Not a plug of this house" : "Not a plug of this site" });
  }
  const plugs = new Map(
    found.map((p) => [p.id, { id: p.id, name: p.name, deviceId: p.device_id, retired: p.retired_at !== null, houseId: p.house_id, houseName: p.house_name }]),
  );
  const { start, end } = localDayRange(filter, timeZone);
  return { plugs, plugIds: [...plugs.keys()], cause: filter.cause, userId: filter.userId, start, end };
}

type Statement = { sql: string; values: unknown[] };

/** The conditions every shape shares: dates, keyset, cause and person, on the alias `e`. */
function commonWhere(scope: Scope, cursor: SwitchCursor | null): Statement {
  const where: string[] = [];
  const values: unknown[] = [];
  const add = (condition: string, ...params: unknown[]) => {
    where.push(condition);
    values.push(...params);
  };
  if (scope.start) add("e.at >= ?", scope.start);
  if (scope.end) add("e.at < ?", scope.end);
  // `at <= c` is the range the index walks; the tie on `at` is settled by id.
  if (cursor) add("e.at <= ? AND (e.at < ? OR e.id < ?)", cursor.at, cursor.at, cursor.id);
  const cause = scope.cause ?? (scope.userId ? "override" : undefined);
  if (cause) add("e.cause = ?", cause);
  if (scope.userId) add("e.user_id = ?", scope.userId);
  return { sql: where.map((w) => ` AND ${w}`).join(""), values };
}

const COLUMNS = `e.id, e.at, e.plug_id, e.from_on, e.to_on, e.cause, e.reading_temp_c, e.reading_at, e.user_id,
  u.name AS user_name, o.reason, e.command_id, e.ack_at, e.latency_ms, e.withdrawn_at, e.rated_watts`;

const PEOPLE = "LEFT JOIN `user` u ON u.id = e.user_id LEFT JOIN overrides o ON o.id = e.override_id";

const INDEX: Record<Exclude<Shape, "merge">, string> = {
  plug: "switch_events_plug_at_idx",
  cause: "switch_events_cause_at_idx",
  time: "switch_events_at_idx",
};

/** The statement for one page of `limit` rows after `cursor`, newest first. */
function pageQuery(scope: Scope, cursor: SwitchCursor | null, limit: number, shape: Shape): Statement {
  if (shape === "merge") {
    const where = commonWhere(scope, cursor);
    const perPlug = scope.plugIds.map(
      () => `(SELECT e.id, e.at FROM switch_events e FORCE INDEX (switch_events_plug_at_idx)
        WHERE e.plug_id = ?${where.sql} ORDER BY e.at DESC, e.id DESC LIMIT ?)`,
    );
    return {
      sql: `SELECT STRAIGHT_JOIN ${COLUMNS} FROM (${perPlug.join(" UNION ALL ")}) k
        JOIN switch_events e ON e.id = k.id ${PEOPLE}
        ORDER BY k.at DESC, k.id DESC LIMIT ?`,
      values: [...scope.plugIds.flatMap((id) => [id, ...where.values, limit]), limit],
    };
  }
  return indexQuery(scope, cursor, limit, shape);
}

/** The rows after `cursor` along one index, newest first: `limit` of them, or every one when it is null. */
function indexQuery(scope: Scope, cursor: SwitchCursor | null, limit: number | null, shape: Exclude<Shape, "merge">): Statement {
  const where = commonWhere(scope, cursor);
  const plugs = shape === "plug" ? "e.plug_id = ?" : `e.plug_id IN (${scope.plugIds.map(() => "?").join(", ")})`;
  return {
    sql: `SELECT STRAIGHT_JOIN ${COLUMNS} FROM switch_events e FORCE INDEX (${INDEX[shape]}) ${PEOPLE}
      WHERE ${plugs}${where.sql} ORDER BY e.at DESC, e.id DESC${limit === null ? "" : " LIMIT ?"}`,
    values: [...scope.plugIds, ...where.values, ...(limit === null ? [] : [limit])],
  };
}

/** A row as COLUMNS lists it (read as arrays: a large export makes no object per row from the driver). */
type RawRow = [
  id: number | string,
  at: Date,
  plugId: string,
  fromOn: number | null,
  toOn: number,
  cause: SwitchCause,
  readingTempC: string | number | null,
  readingAt: Date | null,
  userId: string | null,
  userName: string | null,
  reason: string | null,
  commandId: string,
  ackAt: Date | null,
  latencyMs: number | null,
  withdrawnAt: Date | null,
  ratedWatts: number | null,
];

function toRow(r: RawRow, plug: ScopePlug): SwitchHistoryRow {
  const [id, at, plugId, fromOn, toOn, cause, readingTempC, readingAt, userId, userName, reason, commandId, ackAt, latencyMs, withdrawnAt, ratedWatts] = r;
  return {
    id: Number(id),
    at,
    plugId,
    plugName: plug.name,
    plugDeviceId: plug.deviceId,
    plugRetired: plug.retired,
    houseId: plug.houseId,
    houseName: plug.houseName,
    fromOn: fromOn === null ? null : Boolean(fromOn),
    toOn: Boolean(toOn),
    cause,
    status: switchStatus({ cause, withdrawnAt, ackAt }),
    readingTempC: readingTempC === null ? null : Number(readingTempC),
    readingAt,
    userId,
    userName,
    reason,
    commandId,
    ackAt,
    latencyMs,
    withdrawnAt,
    ratedWatts,
  };
}

async function readPage(scope: Scope, cursor: SwitchCursor | null, limit: number) {
  if (scope.plugIds.length === 0) return [];
  const statement = pageQuery(scope, cursor, limit, pageShape(scope));
  const [found] = await getPool().query({ sql: statement.sql, values: statement.values, rowsAsArray: true });
  return (found as RawRow[]).map((r) => toRow(r, scope.plugs.get(r[2])!));
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
  const found = await readPage(scope, after, limit + 1);
  const page = found.slice(0, limit);
  const last = page.at(-1);
  return { rows: page, nextCursor: found.length > limit && last ? encodeSwitchCursor(last) : null };
}

/** A row of an export's one read, as COLUMNS lists it, instants as the server's UTC text "YYYY-MM-DD HH:MM:SS.mmm" (no Date made per row). */
export type SwitchStreamRow = [
  id: number | string,
  at: string,
  plugId: string,
  fromOn: number | null,
  toOn: number,
  cause: SwitchCause,
  readingTempC: string | null,
  readingAt: string | null,
  userId: string | null,
  userName: string | null,
  reason: string | null,
  commandId: string,
  ackAt: string | null,
  latencyMs: number | null,
  withdrawnAt: string | null,
  ratedWatts: number | null,
];

export type SwitchRowHandlers = {
  row: (row: SwitchStreamRow) => void;
  /** Every row was given; the connection is back in the pool. */
  end: () => void;
  /** The query failed or its connection was lost; the connection is closed. */
  error: (error: Error) => void;
};

export type SwitchHistoryStream = {
  /** The plugs the filter covers, by id: names are looked up here rather than joined per row. */
  plugs: ReadonlyMap<string, ScopePlug>;
  /** Where the rows go, newest first. The rows wait for the first resume(), so listen first. */
  listen: (handlers: SwitchRowHandlers) => void;
  /** Stops the rows: the driver stops reading the socket, and the server waits. */
  pause: () => void;
  resume: () => void;
  /**
   * Stops for good (a reader gone): the connection is closed, as the server may still be
   * sending the rest, and no handler is called again. Harmless after end or error.
   */
  close: () => void;
};

/**
 * Every switch the filter covers, newest first, as one query streamed from its own pool
 * connection (an export of millions: no round trip per batch, no Date per row, no
 * stream object per row). The filter is checked before this returns, so bad input still
 * throws while an error answer can be sent.
 */
export async function openSwitchHistoryStream({ siteId, timeZone, filter }: { siteId: string; timeZone: string; filter: SwitchFilter }): Promise<SwitchHistoryStream> {
  const scope = await resolveScope(siteId, filter, timeZone);
  if (scope.plugIds.length === 0) {
    let handlers: SwitchRowHandlers | null = null;
    const end = () => {
      const listening = handlers;
      handlers = null;
      listening?.end();
    };
    return { plugs: scope.plugs, listen: (h) => void (handlers = h), pause: () => {}, resume: end, close: () => void (handlers = null) };
  }
  const statement = indexQuery(scope, null, null, streamShape(scope));
  const connection = await getPool().getConnection();
  // The promise wrapper's `connection` is the callback-style one (its typings say otherwise).
  const core = connection.connection as unknown as CoreConnection;
  let state: "reading" | "ended" | "closed" = "reading";
  let handlers: SwitchRowHandlers | null = null;
  const close = () => {
    if (state === "closed") return;
    const ended = state === "ended";
    state = "closed";
    core.removeListener("error", fail);
    // A connection goes back to the pool reading: a paused one would hang whoever takes it next.
    if (ended) {
      core.resume();
      connection.release();
    } else connection.destroy();
  };
  function fail(error: Error) {
    if (state !== "reading") return;
    close();
    handlers?.error(error);
  }
  const query = core.query({ sql: statement.sql, values: statement.values, rowsAsArray: true, dateStrings: true });
  // Paused only once the query is sent: mysql2 would hold back the sending itself otherwise.
  core.pause();
  query.on("result", (row) => {
    if (state === "reading") handlers?.row(row as unknown as SwitchStreamRow);
  });
  query.on("error", fail);
  query.on("end", () => {
    if (state !== "reading") return;
    state = "ended";
    close();
    handlers?.end();
  });
  // A lost connection is told to the connection, not to a query without a callback.
  core.once("error", fail);
  return {
    plugs: scope.plugs,
    listen: (h) => void (handlers = h),
    // Only while this query reads: after its end the connection is the pool's.
    pause: () => {
      if (state === "reading") core.pause();
    },
    resume: () => {
      if (state === "reading") core.resume();
    },
    close,
  };
}

const instant = (utc: string | null) => (utc === null ? null : new Date(`${utc.slice(0, 10)}T${utc.slice(11)}Z`));

function typedRow(r: SwitchStreamRow, plug: ScopePlug): SwitchHistoryRow {
  const [id, at, plugId, fromOn, toOn, cause, readingTempC, readingAt, userId, userName, reason, commandId, ackAt, latencyMs, withdrawnAt, ratedWatts] = r;
  const typed: RawRow = [id, instant(at)!, plugId, fromOn, toOn, cause, readingTempC, instant(readingAt), userId, userName, reason, commandId, instant(ackAt), latencyMs, instant(withdrawnAt), ratedWatts];
  return toRow(typed, plug);
}

/**
 * Every switch the filter covers, newest first, as typed rows in batches of `batchSize`,
 * read through openSwitchHistoryStream: the rows wait while the caller works on a batch.
 */
export async function* streamSwitchHistory({
  siteId,
  timeZone,
  filter,
  batchSize = 1000,
}: {
  siteId: string;
  timeZone: string;
  filter: SwitchFilter;
  batchSize?: number;
}): AsyncGenerator<SwitchHistoryRow[]> {
  const stream = await openSwitchHistoryStream({ siteId, timeZone, filter });
  const ready: SwitchHistoryRow[][] = [];
  let batch: SwitchHistoryRow[] = [];
  let ended = false;
  let failure: Error | null = null;
  let wake: (() => void) | null = null;
  stream.listen({
    row: (r) => {
      batch.push(typedRow(r, stream.plugs.get(r[2])!));
      if (batch.length < batchSize) return;
      ready.push(batch);
      batch = [];
      stream.pause();
      wake?.();
    },
    end: () => {
      if (batch.length) ready.push(batch);
      ended = true;
      wake?.();
    },
    error: (error) => {
      failure = error;
      wake?.();
    },
  });
  try {
    for (;;) {
      const next = ready.shift();
      if (next) {
        yield next;
        continue;
      }
      if (failure) throw failure;
      if (ended) return;
      await new Promise<void>((resolve) => {
        wake = resolve;
        stream.resume();
      });
      wake = null;
    }
  } finally {
    stream.close();
  }
}

/** The filter form's choices: houses, plugs (retired ones marked) and the people who made overrides. */
export async function getSwitchHistoryChoices({ siteId }: { siteId: string }) {
  const [houses, plugs, people] = await Promise.all([
    rows<{ id: string; name: string }>("SELECT id, name FROM houses WHERE site_id = ? ORDER BY name", [siteId]),
    rows<{ id: string; name: string; house_id: string; retired_at: Date | null }>(
      "SELECT id, name, house_id, retired_at FROM plugs WHERE site_id = ? ORDER BY retired_at IS NOT NULL, name",
      [siteId],
    ),
    rows<{ id: string; name: string }>(
      "SELECT DISTINCT u.id, u.name FROM overrides o JOIN plugs p ON p.id = o.plug_id AND p.site_id = ? JOIN `user` u ON u.id = o.user_id ORDER BY u.name",
      [siteId],
    ),
  ]);
  return {
    houses,
    plugs: plugs.map((p) => ({ id: p.id, name: p.name, houseId: p.house_id, retired: p.retired_at !== null })),
    people,
  };
}

export type SwitchHistoryChoices = Awaited<ReturnType<typeof getSwitchHistoryChoices>>;

/** The plan MariaDB picks for a first page (for the benchmark and for reading): one line per table. */
export async function explainSwitchHistory({ siteId, timeZone, filter, limit }: { siteId: string; timeZone: string; filter: SwitchFilter; limit: number }) {
  const scope = await resolveScope(siteId, filter, timeZone);
  const shape = pageShape(scope);
  const statement = pageQuery(scope, null, limit + 1, shape);
  const plan = await rows<Record<string, unknown>>(`EXPLAIN ${statement.sql}`, statement.values);
  const distinct = [...new Map(plan.map((r) => [`${r.table} ${r.key} ${r.Extra}`, r])).values()];
  return {
    shape,
    rows: distinct.map((r) => `${r.select_type} ${r.table}: ${r.type} via ${r.key ?? "—"}, ~${r.rows} rows${r.Extra ? `; ${r.Extra}` : ""}`),
  };
}
