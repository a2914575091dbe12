// Reading backups back: counting the rows of mariadb-dump's INSERT statements, telling
// a complete dump from a cut-off or foreign one, and which dated files a prune removes.
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { BACKUP_MARK, DumpScanner, TupleCounter, backupHeader } from "@/scripts/backup/dump-format";
import { backupFileName, backupFileTime, pruneBackups } from "@/scripts/backup/files";

const header = backupHeader({ database: "cloche", madeAt: new Date("2026-12-03T22:15:00Z"), server: "10.11.19-MariaDB" });
const dump = (body: string) =>
  `${header}/*M!999999\\- enable the sandbox mode */ \n-- MariaDB dump 10.19  Distrib 10.11.19-MariaDB\n${body}-- Dump completed on 2026-12-03 22:15:01\n`;

function scan(text: string, pieces = 7) {
  const scanner = new DumpScanner();
  // In awkward pieces, as a stream delivers them.
  for (let i = 0; i < text.length; i += pieces) scanner.push(Buffer.from(text.slice(i, i + pieces)));
  return scanner.finish();
}

describe("TupleCounter", () => {
  it("counts rows whose strings hold brackets, quotes, escapes and semicolons", () => {
    const counter = new TupleCounter();
    expect(counter.feed(`('a(b','it''s',NULL),`)).toBe(false);
    expect(counter.feed(`('x\\'); (y','z;'),`)).toBe(false);
    expect(counter.feed(`(0x28FF,'\\\\',3);`)).toBe(true);
    expect(counter.tuples).toBe(3);
  });
});

describe("DumpScanner", () => {
  it("reads the header and counts rows of both INSERT layouts", () => {
    const summary = scan(
      dump(
        "CREATE TABLE `plugs` (\n  `id` varchar(36)\n);\nINSERT INTO `plugs` VALUES\n('a'),\n('b;(c');\n" +
          "CREATE TABLE `sites` (\n  `id` int\n);\nCREATE TABLE `odd``name` (\n  `id` int\n);\n" +
          "INSERT INTO `odd``name` VALUES (1),(2),(3);\nINSERT INTO `plugs` VALUES ('d');\n",
      ),
    );
    expect(summary.header).toEqual({ database: "cloche", madeAt: new Date("2026-12-03T22:15:00Z"), server: "10.11.19-MariaDB" });
    expect(summary.tables).toEqual(["plugs", "sites", "odd`name"]);
    expect(Object.fromEntries(summary.rows)).toEqual({ plugs: 3, sites: 0, "odd`name": 3 });
    expect(summary.completedAt).toBe("2026-12-03 22:15:01");
  });

  it("refuses a dump cut off before its last line, or inside a statement", () => {
    const whole = dump("CREATE TABLE `plugs` (\n  `id` int\n);\nINSERT INTO `plugs` VALUES\n(1),\n(2);\n");
    expect(() => scan(whole.slice(0, whole.indexOf("-- Dump completed")))).toThrow(/does not end with mariadb-dump's "-- Dump completed" line/);
    expect(() => scan(whole.slice(0, whole.indexOf("(2)")) + "-- Dump completed on 2026-12-03\n")).toThrow(/cut off in the middle of the rows of plugs/);
  });

  it("refuses text that is not a Cloche backup", () => {
    expect(() => scan("-- MariaDB dump 10.19\n-- Dump completed on 2026-12-03\n")).toThrow(/not a Cloche backup/);
    expect(() => scan(`${BACKUP_MARK}\nDROP TABLE plugs;\n`)).toThrow(/not a MariaDB dump/);
    expect(() => scan(`${BACKUP_MARK}\n-- MariaDB dump 10.19\n-- Dump completed\n`)).toThrow(/lacks the database name/);
  });
});

describe("backup files", () => {
  let folder: string | undefined;
  afterEach(() => folder && rmSync(folder, { recursive: true, force: true }));

  it("names files by database and UTC time, and reads the time back", () => {
    const at = new Date("2026-12-03T22:15:00.456Z");
    expect(backupFileName("cloche", at)).toBe("cloche-2026-12-03T22-15-00Z.sql.gz");
    expect(backupFileTime("cloche", "cloche-2026-12-03T22-15-00Z.sql.gz")).toEqual(new Date("2026-12-03T22:15:00Z"));
    expect(backupFileTime("cloche", "cloche_test-2026-12-03T22-15-00Z.sql.gz")).toBeNull();
    expect(backupFileTime("cloche", "cloche-2026-12-03T22-15-00Z.sql.gz.bak")).toBeNull();
  });

  it("prunes only this database's dated files (and stale partial ones) older than the days kept", () => {
    folder = mkdtempSync(path.join(tmpdir(), "cloche-prune-"));
    const names = [
      "cloche-2026-11-20T02-00-00Z.sql.gz", // 13 days + 20 h old: goes
      "cloche-2026-11-26T22-16-00Z.sql.gz", // just under 7 days: stays
      "cloche-2026-11-26T22-14-00Z.sql.gz", // just over 7 days: goes
      ".cloche-2026-11-01T02-00-00Z.sql.gz.partial-123", // a cut-short backup: goes
      "cloche_copy-2026-11-01T02-00-00Z.sql.gz", // another database: stays
      "notes.txt",
    ];
    for (const name of names) writeFileSync(path.join(folder, name), "x");
    const removed = pruneBackups(folder, "cloche", 7, new Date("2026-12-03T22:15:00Z"));
    expect(removed).toEqual([".cloche-2026-11-01T02-00-00Z.sql.gz.partial-123", "cloche-2026-11-20T02-00-00Z.sql.gz", "cloche-2026-11-26T22-14-00Z.sql.gz"]);
    expect(readdirSync(folder).sort()).toEqual(["cloche-2026-11-26T22-16-00Z.sql.gz", "cloche_copy-2026-11-01T02-00-00Z.sql.gz", "notes.txt"]);
  });
});
