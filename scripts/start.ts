// `npm start`: a private MariaDB, migrations, the demo, a build when the sources
// changed, and the web app on http://127.0.0.1:3000, with the controller, the
// simulated devices and the local mail sink. Each of those is supervised: one that dies is restarted with
// back-off while the others keep running (scripts/supervisor.ts, scripts/stack.ts).
// Ctrl-C stops all of it.
import { DEV_DATABASE_FOLDER, LocalDatabaseError, devDatabasePort, startLocalDatabase, type LocalDatabase } from "./local-server";
import { DEMO_MEMBERS, DEMO_SITE } from "../db/seed";
import path from "node:path";
import { dataFolder, say } from "./common";
import { startStack, type Stack } from "./stack";

const port = Number(process.env.PORT ?? 3000);
const mqttPort = Number(process.env.CLOCHE_MQTT_PORT ?? 1886);
// Derived from PORT by default, so two npm starts on different PORTs don't collide.
const smtpPort = Number(process.env.CLOCHE_SMTP_PORT ?? port - 475);
const host = "127.0.0.1";

let database: LocalDatabase | undefined;
let stack: Stack | undefined;
let stopping: Promise<void> | undefined;

function shutdown(code: number) {
  stopping ??= (async () => {
    say("stopping…");
    await stack?.stop();
    await database?.stop();
    say("stopped.");
    process.exit(code);
  })();
  return stopping;
}

process.on("SIGINT", () => void shutdown(0));
process.on("SIGTERM", () => void shutdown(0));

async function main() {
  const began = Date.now();
  let databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl) {
    say("using the MariaDB in DATABASE_URL");
  } else {
    database = await startLocalDatabase({ folder: DEV_DATABASE_FOLDER, port: devDatabasePort(), database: "cloche" });
    databaseUrl = database.url;
  }

  stack = await startStack({
    databaseUrl,
    host,
    port,
    mqttPort,
    smtpPort,
    mailFolder: path.join(dataFolder, "mail"),
    mqttUrl: process.env.MQTT_URL,
    historyDays: 60,
    onGaveUp: (name, all) => {
      if (all) void shutdown(1);
      else say(`${name} is not running now; the rest keeps going. Ctrl-C stops everything.`);
    },
  });
  const { url, env } = stack;

  const width = Math.max(...DEMO_MEMBERS.map((m) => m.email.length));
  console.log(
    [
      "",
      `  Cloche is running at ${url}   (ready in ${((Date.now() - began) / 1000).toFixed(1)} s)`,
      "",
      `  Demo site: ${DEMO_SITE.name}. Sign in as:`,
      ...DEMO_MEMBERS.map((m) => `    ${m.role.padEnd(7)} ${m.email.padEnd(width)}  password ${m.password}`),
      "",
      database ? `  MariaDB: 127.0.0.1:${database.port} (data in .data/mariadb)` : "  MariaDB: DATABASE_URL",
      `  MQTT broker (in the controller): ${env.CLOCHE_MQTT_URL}; simulated plugs and sensors for the demo site`,
      `  Mail (invitations, alerts, daily summaries) is kept, not delivered: read it at ${url}/dev/mail   (SMTP sink ${env.CLOCHE_SMTP_URL})`,
      "  Ctrl-C stops everything.",
      "",
    ].join("\n"),
  );
}

main().catch((error) => {
  console.error(`[cloche] ${error instanceof LocalDatabaseError ? error.message : error?.stack ?? error}`);
  void shutdown(1);
});
