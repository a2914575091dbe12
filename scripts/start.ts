// `npm start`: a private MariaDB, migrations, the demo, a build when the sources
// changed, and the web app on http://127.0.0.1:3000, with the controller, the
// simulated devices and the local mail sink. Each of those is supervised: one that dies is restarted with
// back-off while the others keep running (scripts/supervisor.ts). Ctrl-C stops all of it.
import { DEV_DATABASE_FOLDER, LocalDatabaseError, devDatabasePort, startLocalDatabase, type LocalDatabase } from "./local-server";
import { migrateDatabase } from "../db/migrate";
import { connect } from "../db/client";
import { DEMO_MEMBERS, DEMO_SITE, seedDemo } from "../db/seed";
import { writeDemoHistory } from "../fakes/demo-history";
import { buildIsCurrent, markBuilt, sourceHash } from "./build-stamp";
import { DEVICE_SECRETS_FILE, issueDemoDeviceSecrets } from "./demo-devices";
import path from "node:path";
import { bin, dataFolder, persistentSecret, portIsFree, root, run, say, waitForHttp, waitForPort } from "./common";
import { superviseService, type Supervisor } from "./supervisor";

const port = Number(process.env.PORT ?? 3000);
const mqttPort = Number(process.env.CLOCHE_MQTT_PORT ?? 1886);
// Derived from PORT by default, so two npm starts on different PORTs don't collide.
const smtpPort = Number(process.env.CLOCHE_SMTP_PORT ?? port - 475);
const mailFolder = path.join(dataFolder, "mail");
const host = "127.0.0.1";
const url = process.env.BETTER_AUTH_URL ?? `http://${host}:${port}`;

let database: LocalDatabase | undefined;
const services: Supervisor[] = [];
let stopping: Promise<void> | undefined;

function shutdown(code: number) {
  stopping ??= (async () => {
    say("stopping…");
    // The web app and the simulated devices go before the controller, whose broker they use.
    for (const service of [...services].reverse()) await service.stop();
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
  if (!(await portIsFree(port, host))) {
    throw new LocalDatabaseError(`Port ${port} on ${host} is in use (another npm start?). Stop it, or choose another with PORT.`);
  }

  let databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl) {
    say("using the MariaDB in DATABASE_URL");
  } else {
    database = await startLocalDatabase({ folder: DEV_DATABASE_FOLDER, port: devDatabasePort(), database: "cloche" });
    databaseUrl = database.url;
  }

  say("applying migrations…");
  await migrateDatabase(databaseUrl);
  const { db, pool } = connect(databaseUrl);
  try {
    const { created } = await seedDemo(db);
    const added = Object.values(created).reduce((a, b) => a + b, 0);
    say(added ? `demo site seeded (${added} rows)` : "demo site already present");
    say(`issued MQTT credentials for ${await issueDemoDeviceSecrets(db, DEMO_SITE.slug)} demo devices`);
    const history = await writeDemoHistory({ db, site: DEMO_SITE.slug, days: 60, endMs: Date.now() });
    if (!history.skipped) say(`wrote 60 days of demo history (${history.switches} switches, ${history.minutes} minutes of readings)`);
  } finally {
    await pool.end();
  }

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    DATABASE_URL: databaseUrl,
    BETTER_AUTH_URL: url,
    BETTER_AUTH_SECRET: persistentSecret("auth-secret", process.env.BETTER_AUTH_SECRET),
    CLOCHE_MQTT_URL: process.env.MQTT_URL ?? `mqtt://127.0.0.1:${mqttPort}`,
    CLOCHE_MQTT_PORT: String(mqttPort),
    CLOCHE_MQTT_CONTROLLER_SECRET: persistentSecret("mqtt-controller-secret", process.env.CLOCHE_MQTT_CONTROLLER_SECRET),
    CLOCHE_MQTT_WEBAPP_SECRET: persistentSecret("mqtt-webapp-secret", process.env.CLOCHE_MQTT_WEBAPP_SECRET),
    CLOCHE_DEVICE_SECRETS: DEVICE_SECRETS_FILE,
    // Mail goes to the local sink, whose messages /dev/mail shows.
    CLOCHE_SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    CLOCHE_MAIL_SINK_DIR: mailFolder,
    CLOCHE_MAIL_SINK_PORT: String(smtpPort),
    NEXT_TELEMETRY_DISABLED: "1",
  };

  const hash = sourceHash();
  if (buildIsCurrent(hash)) {
    say("build is up to date");
  } else {
    say("building the web app (next build)…");
    const code = await run(bin("next"), ["build"], env);
    if (code !== 0) throw new LocalDatabaseError("next build failed; see its output above.");
    markBuilt(hash);
  }

  if (!(await portIsFree(smtpPort, host))) {
    throw new LocalDatabaseError(`Port ${smtpPort} on ${host} (the local mail sink) is in use. Choose another with CLOCHE_SMTP_PORT.`);
  }
  if (!process.env.MQTT_URL && !(await portIsFree(mqttPort, host))) {
    throw new LocalDatabaseError(`Port ${mqttPort} on ${host} (the MQTT broker) is in use. Choose another with CLOCHE_MQTT_PORT.`);
  }
  // TypeScript entries run in one process each (`node --import tsx`, no tsx wrapper),
  // so the pid the supervisor watches is the service itself.
  const supervise = (name: string, command: string, args: string[], serviceEnv = env) =>
    superviseService({ name, command, args, env: serviceEnv, cwd: root }).then((service) => {
      services.push(service);
      void service.gaveUp.then(() => {
        if (services.every((s) => s.state === "given-up")) void shutdown(1);
        else say(`${name} is not running now; the rest keeps going. Ctrl-C stops everything.`);
      });
      return service;
    });
  const controller = await supervise("controller", process.execPath, ["--import", "tsx", "controller/index.ts"]);
  // The simulated devices need the controller's broker to be listening when they start.
  const brokerUrl = new URL(env.CLOCHE_MQTT_URL!);
  const brokerUp = await waitForPort(Number(brokerUrl.port || 1883), brokerUrl.hostname, 60_000, () => controller.state !== "given-up");
  if (!brokerUp) throw new LocalDatabaseError(`the MQTT broker at ${env.CLOCHE_MQTT_URL} did not answer within 60 s.`);
  await supervise("fakes", process.execPath, ["--import", "tsx", "fakes/index.ts"], { ...env, MQTT_URL: env.CLOCHE_MQTT_URL });
  const mailSink = await supervise("mail-sink", process.execPath, ["--import", "tsx", "fakes/mail-sink.ts"]);
  const sinkUp = await waitForPort(smtpPort, host, 30_000, () => mailSink.state !== "given-up");
  if (!sinkUp) say(`the mail sink did not answer on ${host}:${smtpPort}; invitations cannot be sent until it does.`);
  const web = await supervise("web", bin("next"), ["start", "--hostname", host, "--port", String(port)]);

  const ready = await waitForHttp(`${url}/api/health`, 60_000, () => web.state !== "given-up");
  if (!ready) throw new LocalDatabaseError("the web app did not answer /api/health within 60 s.");

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
      `  Mail (invitations) is kept, not delivered: read it at ${url}/dev/mail   (SMTP sink ${env.CLOCHE_SMTP_URL})`,
      "  Ctrl-C stops everything.",
      "",
    ].join("\n"),
  );
}

main().catch((error) => {
  console.error(`[cloche] ${error instanceof LocalDatabaseError ? error.message : error?.stack ?? error}`);
  void shutdown(1);
});
