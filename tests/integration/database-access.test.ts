// The private MariaDB is locked (scripts/local-server.ts): root only through the
// server's own socket with its generated password, the app's user on its own
// databases only. Checked against the server `npm test` started.
import { existsSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { TEST_DATABASE_FOLDER } from "@/scripts/local-server";

const url = new URL(process.env.DATABASE_URL!);
const port = Number(url.port);
const instanceFile = path.join(TEST_DATABASE_FOLDER, "instance.json");

async function refusal(options: mysql.ConnectionOptions) {
  try {
    const connection = await mysql.createConnection({ host: "127.0.0.1", port, connectTimeout: 5000, ...options });
    await connection.end();
    return "accepted";
  } catch (error) {
    return (error as { code?: string }).code;
  }
}

describe("the private MariaDB's accounts", () => {
  it("refuses root over TCP without a password", async () => {
    expect(await refusal({ user: "root" })).toBe("ER_ACCESS_DENIED_ERROR");
    expect(await refusal({ user: "root", password: "" })).toBe("ER_ACCESS_DENIED_ERROR");
  });

  it("refuses root over TCP even with its password: root is for the socket only", async () => {
    expect(existsSync(instanceFile)).toBe(true);
    const instance = JSON.parse(readFileSync(instanceFile, "utf8")) as { port: number; rootPassword?: string };
    expect(instance.port).toBe(port);
    expect(instance.rootPassword).toMatch(/^[\w-]{20,}$/);
    expect(statSync(instanceFile).mode & 0o077).toBe(0);
    expect(await refusal({ user: "root", password: instance.rootPassword })).toBe("ER_ACCESS_DENIED_ERROR");
  });

  it("refuses anonymous logins", async () => {
    expect(await refusal({ user: "" })).toBe("ER_ACCESS_DENIED_ERROR");
  });
});

describe("the app's user", () => {
  let app: mysql.Connection;
  beforeAll(async () => {
    app = await mysql.createConnection({ uri: url.toString() });
  });
  afterAll(async () => {
    await app.end();
  });

  const denied = async (sql: string) => {
    try {
      await app.query(sql);
      return "allowed";
    } catch (error) {
      return (error as { code?: string }).code;
    }
  };

  it("cannot read the server's own tables or another database", async () => {
    expect(await denied("SELECT User FROM mysql.user")).toBe("ER_TABLEACCESS_DENIED_ERROR");
    expect(await denied("USE mysql")).toBe("ER_DBACCESS_DENIED_ERROR");
    expect(await denied("CREATE DATABASE not_cloches")).toBe("ER_DBACCESS_DENIED_ERROR");
    expect(await denied("CREATE DATABASE clocheXtest")).toBe("ER_DBACCESS_DENIED_ERROR");
  });

  it("sees only its own database", async () => {
    const [rows] = await app.query("SHOW DATABASES");
    const names = (rows as { Database: string }[]).map((r) => r.Database).filter((n) => n !== "information_schema");
    expect(names.every((n) => n === url.pathname.slice(1) || n.startsWith(`${url.pathname.slice(1)}_`))).toBe(true);
    expect(names).toContain(url.pathname.slice(1));
  });

  it("holds no global privilege", async () => {
    const [rows] = await app.query("SHOW GRANTS");
    const grants = (rows as Record<string, string>[]).map((r) => Object.values(r)[0]!);
    const global = grants.filter((g) => / ON \*\.\* /.test(g));
    expect(global.every((g) => g.startsWith("GRANT USAGE ON *.*"))).toBe(true);
  });
});
