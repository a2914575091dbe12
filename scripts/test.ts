// `npm test`: a private MariaDB with a fresh database, a local mail sink, migrations,
// type-check, lint, then the unit and integration tests against them.
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { LocalDatabaseError, TEST_DATABASE_FOLDER, startLocalDatabase, type LocalDatabase } from "./local-server";
import { migrateDatabase } from "../db/migrate";
import { bin, run, say } from "./common";
import { ensureProgram } from "./debian";
import { startMailSink, type MailSink } from "../fakes/mail-sink";

let database: LocalDatabase | undefined;
let mailSink: MailSink | undefined;

async function main() {
  const began = Date.now();
  // The controller is also tested against an external broker: Debian's mosquitto.
  ensureProgram(["mosquitto"], "mosquitto", "mosquitto (MQTT broker for the external-broker test)", (line) => say(line));
  database = await startLocalDatabase({ folder: TEST_DATABASE_FOLDER, port: 0, database: "cloche_test", fresh: true, scratchDatabases: true });
  await migrateDatabase(database.url);
  say(`test database ready on 127.0.0.1:${database.port}`);
  // Integration tests send mail through a sink of their own and read it back from its folder.
  const mailFolder = mkdtempSync(path.join(tmpdir(), "cloche-test-mail-"));
  mailSink = await startMailSink({ port: 0, folder: mailFolder });

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
  const steps: [string, string, string[]][] = [
    ...checks,
    ["unit and integration tests", bin("vitest"), ["run", ...process.argv.slice(2)]],
  ];
  for (const [label, command, args] of steps) {
    say(`${label}…`);
    const code = await run(command, args, env);
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
  await mailSink?.close();
  if (mailSink) rmSync(mailSink.folder, { recursive: true, force: true });
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
