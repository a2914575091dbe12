// `npm test`: a private MariaDB with a fresh database, a local mail sink, migrations,
// type-check, lint, the unit, component and integration tests against them, then the
// browser journeys against the whole product started as `npm start` starts it.
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import mysql from "mysql2/promise";
import { LocalDatabaseError, TEST_DATABASE_FOLDER, freePort, startLocalDatabase, type LocalDatabase } from "./local-server";
import { migrateDatabase } from "../db/migrate";
import { bin, dataFolder, run, say } from "./common";
import { ensureProgram } from "./debian";
import { startStack, type Stack } from "./stack";
import { startMailSink, type MailSink } from "../fakes/mail-sink";

let database: LocalDatabase | undefined;
let stack: Stack | undefined;
let mailSink: MailSink | undefined;
const scratchFolders: string[] = [];

function scratchFolder(name: string) {
  const folder = mkdtempSync(path.join(tmpdir(), `cloche-test-${name}-`));
  scratchFolders.push(folder);
  return folder;
}

const BROWSER_FOLDER = "tests/browser";
const args = process.argv.slice(2);
/** Arguments that are paths pick test files; browser journeys run when none is given or one points at them. */
const paths = args.filter((a) => !a.startsWith("-"));
const runsBrowser = paths.length === 0 || paths.some((p) => p.replace(/^\.\//, "").startsWith(BROWSER_FOLDER));
const vitestPaths = paths.filter((p) => !p.replace(/^\.\//, "").startsWith(BROWSER_FOLDER));
const runsVitest = paths.length === 0 || vitestPaths.length > 0;

/** The browser journeys' own database beside the tests' one, emptied first. */
async function browserDatabase(testUrl: string): Promise<string> {
  const url = new URL(testUrl);
  const name = `${url.pathname.slice(1)}_browser`;
  const admin = await mysql.createConnection({ uri: testUrl });
  try {
    await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await admin.end();
  }
  url.pathname = `/${name}`;
  return url.toString();
}

async function browserJourneys(env: NodeJS.ProcessEnv): Promise<number> {
  ensureProgram(["chromium"], "chromium", "Chromium (the browser journeys)", (line) => say(line));
  const host = "127.0.0.1";
  const port = await freePort();
  const url = `http://${host}:${port}`;
  stack = await startStack({
    databaseUrl: await browserDatabase(env.DATABASE_URL!),
    host,
    port,
    mqttPort: await freePort(),
    smtpPort: await freePort(),
    mailFolder: scratchFolder("browser-mail"),
    historyDays: 2,
    deviceSecretsFile: path.join(dataFolder, "device-secrets.browser-tests.json"),
    // Every journey signs in; the per-address sign-in limit would otherwise throttle them.
    env: { BETTER_AUTH_URL: url, BETTER_AUTH_SECRET: env.BETTER_AUTH_SECRET!, CLOCHE_SIGN_IN_LIMIT: "100" },
  });
  try {
    return await run(bin("vitest"), ["run", "--project", "browser", ...args.filter((a) => a.startsWith("-")), ...paths.filter((p) => !vitestPaths.includes(p))], {
      ...env,
      ...stack.env,
      NODE_ENV: "test",
      CLOCHE_BROWSER_BASE_URL: url,
    });
  } finally {
    await stack.stop();
    stack = undefined;
  }
}

async function main() {
  const began = Date.now();
  // The controller is also tested against an external broker: Debian's mosquitto.
  ensureProgram(["mosquitto"], "mosquitto", "mosquitto (MQTT broker for the external-broker test)", (line) => say(line));
  // The report tests read the PDF export back as text.
  ensureProgram(["pdftotext"], "poppler-utils", "pdftotext (reads the PDF reports back in the tests)", (line) => say(line));
  database = await startLocalDatabase({ folder: TEST_DATABASE_FOLDER, port: 0, database: "cloche_test", fresh: true, scratchDatabases: true });
  await migrateDatabase(database.url);
  say(`test database ready on 127.0.0.1:${database.port}`);
  // Integration tests send mail through a sink of their own and read it back from its folder.
  mailSink = await startMailSink({ port: 0, folder: scratchFolder("mail") });

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "test",
    DATABASE_URL: database.url,
    BETTER_AUTH_URL: "http://127.0.0.1:3000",
    BETTER_AUTH_SECRET: randomBytes(32).toString("base64url"),
    CLOCHE_SMTP_URL: mailSink.url,
    CLOCHE_MAIL_SINK_DIR: mailSink.folder,
    NEXT_TELEMETRY_DISABLED: "1",
  };

  // CLOCHE_SKIP_CHECKS=1 leaves out type-check and lint while iterating on tests.
  const checks: [string, string, string[]][] = process.env.CLOCHE_SKIP_CHECKS
    ? []
    : [
        ["type-check", bin("tsc"), ["--noEmit", "-p", "."]],
        ["lint", bin("eslint"), ["--max-warnings", "0", "."]],
      ];
  const projects = ["--project", "unit", "--project", "components", "--project", "integration"];
  const steps: [string, () => Promise<number>][] = [
    ...checks.map(([label, command, commandArgs]): [string, () => Promise<number>] => [label, () => run(command, commandArgs, env)]),
    ...(runsVitest
      ? [["unit, component and integration tests", () => run(bin("vitest"), ["run", ...projects, ...args.filter((a) => !paths.includes(a) || vitestPaths.includes(a))], env)] as [string, () => Promise<number>]]
      : []),
    // The fault suite's quick scenarios start a stack of their own (scripts/faults.ts).
    ...(paths.length === 0 ? [["fault suite (quick scenarios)", () => run(bin("tsx"), ["scripts/faults.ts", "--quick"], process.env)] as [string, () => Promise<number>]] : []),
    ...(runsBrowser ? [["browser journeys", () => browserJourneys(env)] as [string, () => Promise<number>]] : []),
  ];
  for (const [label, step] of steps) {
    say(`${label}…`);
    const code = await step();
    if (code !== 0) {
      say(`${label} failed (exit ${code}).`);
      return code;
    }
  }
  say(`all green in ${((Date.now() - began) / 1000).toFixed(1)} s`);
  return 0;
}

let finished = false;
async function finish(code: number) {
  if (finished) return;
  finished = true;
  await stack?.stop();
  await mailSink?.close();
  for (const folder of scratchFolders) rmSync(folder, { recursive: true, force: true });
  await database?.stop();
  process.exit(code);
}
process.on("SIGINT", () => void finish(130));
process.on("SIGTERM", () => void finish(143));

main()
  .then(finish)
  .catch((error) => {
    console.error(`[cloche] ${error instanceof LocalDatabaseError ? error.message : error?.stack ?? error}`);
    void finish(1);
  });
