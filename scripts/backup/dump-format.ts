// The shape of a Cloche backup: a few header lines of ours, then mariadb-dump's output
// unchanged, which ends with its "-- Dump completed" line. Reading one back (as it is
// written, and again before a restore) counts the rows of every table from its INSERT
// statements, so a restore can check that every row arrived.
import { StringDecoder } from "node:string_decoder";

export const BACKUP_MARK = "-- Cloche backup, format 1";
const DUMP_MARK = /^-- (MariaDB|MySQL) dump /;
const SANDBOX_MARK = /^\/\*M!999999\\- enable the sandbox mode \*\/ ?$/;
const COMPLETED_MARK = /^-- Dump completed( on (.+))?$/;

export type BackupHeader = { database: string; madeAt: Date; server: string };

export function backupHeader(h: BackupHeader) {
  return [BACKUP_MARK, `-- database: ${h.database}`, `-- made: ${h.madeAt.toISOString()}`, `-- server: ${h.server}`, ""].join("\n");
}

export class DumpFormatError extends Error {}

export type DumpSummary = {
  header: BackupHeader;
  /** Rows per table, counted from the INSERT statements. */
  rows: Map<string, number>;
  /** Tables the dump creates, in its order. */
  tables: string[];
  completedAt: string | null;
};

const INSERT = /^INSERT INTO `((?:[^`]|``)+)` VALUES ?/;
const CREATE = /^CREATE TABLE `((?:[^`]|``)+)` \(/;

/**
 * Counts the value tuples of one INSERT statement, fed line by line (mariadb-dump puts
 * each row on a line of its own; older versions put them all on one). Strings are
 * quoted with ' and escaped with \ or a doubled '.
 */
export class TupleCounter {
  tuples = 0;
  private depth = 0;
  private quoted = false;

  /** Feeds one line; true when the statement's closing `;` was on it. */
  feed(text: string): boolean {
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      if (this.quoted) {
        if (c === 92 /* \ */) i++;
        else if (c === 39 /* ' */) {
          if (text.charCodeAt(i + 1) === 39) i++;
          else this.quoted = false;
        }
      } else if (c === 39) this.quoted = true;
      else if (c === 40 /* ( */) {
        if (this.depth === 0) this.tuples++;
        this.depth++;
      } else if (c === 41 /* ) */) this.depth--;
      else if (c === 59 /* ; */ && this.depth === 0) return true;
    }
    return false;
  }
}

/**
 * Reads a dump's text line by line as it streams past. `push` takes the text in any
 * pieces; `finish` checks the end and returns what was found, or throws a
 * DumpFormatError saying what is wrong.
 */
export class DumpScanner {
  private pending = "";
  private lineNo = 0;
  private header: Partial<BackupHeader> = {};
  private sawDumpMark = false;
  private lastLine = "";
  private readonly rows = new Map<string, number>();
  private readonly tables: string[] = [];
  private readonly decoder = new StringDecoder("utf8");
  private insert: { table: string; counter: TupleCounter } | null = null;

  push(chunk: Buffer | string) {
    const text = typeof chunk === "string" ? chunk : this.decoder.write(chunk);
    const lines = (this.pending + text).split("\n");
    this.pending = lines.pop()!;
    for (const line of lines) this.line(line);
  }

  private line(line: string) {
    this.lineNo++;
    if (line !== "") this.lastLine = line;
    if (this.insert) {
      if (this.insert.counter.feed(line)) this.endInsert();
      return;
    }
    if (this.lineNo === 1 && line !== BACKUP_MARK) {
      throw new DumpFormatError("it is not a Cloche backup (its first line is not the one `npm run backup` writes)");
    }
    if (!this.sawDumpMark) {
      if (DUMP_MARK.test(line)) {
        this.sawDumpMark = true;
        return;
      }
      const field = /^-- (database|made|server): (.*)$/.exec(line);
      if (field) {
        const [, key, value] = field;
        if (key === "made") this.header.madeAt = new Date(value!);
        else this.header[key as "database" | "server"] = value;
        return;
      }
      // Newer mariadb-dump starts with a line that makes older clients stop at once.
      if (line === "" || line === BACKUP_MARK || SANDBOX_MARK.test(line)) return;
      throw new DumpFormatError(`it is not a MariaDB dump (line ${this.lineNo} comes before mariadb-dump's header)`);
    }
    const created = CREATE.exec(line);
    if (created) {
      const table = created[1]!.replaceAll("``", "`");
      this.tables.push(table);
      this.rows.set(table, this.rows.get(table) ?? 0);
      return;
    }
    const insert = INSERT.exec(line);
    if (insert) {
      this.insert = { table: insert[1]!.replaceAll("``", "`"), counter: new TupleCounter() };
      if (this.insert.counter.feed(line.slice(insert[0].length))) this.endInsert();
    }
  }

  private endInsert() {
    const { table, counter } = this.insert!;
    this.rows.set(table, (this.rows.get(table) ?? 0) + counter.tuples);
    this.insert = null;
  }

  finish(): DumpSummary {
    this.pending += this.decoder.end();
    if (this.pending) this.line(this.pending);
    this.pending = "";
    if (!this.sawDumpMark) throw new DumpFormatError("it holds no MariaDB dump");
    if (this.insert) throw new DumpFormatError(`it is cut off in the middle of the rows of ${this.insert.table}`);
    const completed = COMPLETED_MARK.exec(this.lastLine);
    if (!completed) throw new DumpFormatError('it is cut off: it does not end with mariadb-dump\'s "-- Dump completed" line');
    const { database, madeAt, server } = this.header;
    if ((!database || !madeAt || Number.isNaN(madeAt.getTime()))) {
      throw new DumpFormatError("its header lacks the database name or the time it was made");
    }
    return {
      header: { database: database!, madeAt: madeAt!, server: server ?? "" },
      rows: this.rows,
      tables: this.tables,
      completedAt: completed[2] ?? null,
    };
  }
}
