// The running product on one machine, started one way for `npm start` and for the
// browser journeys of `npm test`: migrations and the demo in a database, a build when
// the sources changed, then the controller (with its broker), the simulated devices, the
// local mail sink and the web app, each supervised (scripts/supervisor.ts).
import { migrateDatabase } from "../db/migrate";
import { connect } from "../db/client";
import { DEMO_SITE, seedDemo } from "../db/seed";
import { writeDemoHistory } from "../fakes/demo-history";
import { energyRollupMissing, rebuildEnergyDays } from "../db/energy-days";
import { buildIsCurrent, markBuilt, sourceHash } from "./build-stamp";
import { DEVICE_SECRETS_FILE, issueDemoDeviceSecrets } from "./demo-devices";
import { LocalDatabaseError } from "./local-server";
import { bin, persistentSecret, portIsFree, root, run, say, waitForHttp, waitForPort } from "./common";
import { superviseService, type Supervisor } from "./supervisor";

export type StackOptions = {
  databaseUrl: string;
  host: string;
  port: number;
  mqttPort: number;
  /** The local mail sink's SMTP port, and the folder where it keeps what it receives (/dev/mail shows it). */
  smtpPort: number;
  mailFolder: string;
  /** An external broker instead of the controller's own (MQTT_URL). */
  mqttUrl?: string;
  /** Days of demo history to write once (0: none). */
  historyDays: number;
  /** Where the simulated devices' secrets are written (default .data/device-secrets.json). */
  deviceSecretsFile?: string;
  /** Extra environment for every service (tests tune limits here). */
  env?: Record<string, string>;
  /** Called when a service stops restarting; `all` when none is left running. */
  onGaveUp?: (name: string, all: boolean) => void;
};

export type Stack = {
  url: string;
  mqttUrl: string;
  env: NodeJS.ProcessEnv;
  services: Supervisor[];
  /** Stops the services, the web app and devices before the controller whose broker they use. Idempotent. */
  stop: () => Promise<void>;
};

/** Migrations, the demo site with its devices' credentials and (once) its history. */
export async function prepareDatabase(databaseUrl: string, historyDays: number, deviceSecretsFile = DEVICE_SECRETS_FILE) {
  say("applying migrations…");
  await migrateDatabase(databaseUrl);
  const { db, pool } = connect(databaseUrl, { timeoutMs: Infinity });
  try {
    const { created } = await seedDemo(db);
    const added = Object.values(created).reduce((a, b) => a + b, 0);
    say(added ? `demo site seeded (${added} rows)` : "demo site already present");
    say(`issued MQTT credentials for ${await issueDemoDeviceSecrets(db, DEMO_SITE.slug, deviceSecretsFile)} demo devices`);
    if (historyDays > 0) {
      const history = await writeDemoHistory({ db, site: DEMO_SITE.slug, days: historyDays, endMs: Date.now() });
      if (!history.skipped) say(`wrote ${historyDays} days of demo history (${history.switches} switches, ${history.minutes} minutes of readings)`);
    }
    // A database from before the energy roll-up existed has switches and no roll-up yet.
    if (await energyRollupMissing(db)) {
      say("building the energy roll-up from the switch log (once)…");
      const done = await rebuildEnergyDays(db);
      say(`energy roll-up built: ${done.plugs} plugs, ${done.switches} switches`);
    }
  } finally {
    await pool.end();
  }
}

/** `next build` unless the last build was made from the same sources. */
export async function ensureBuilt(env: NodeJS.ProcessEnv) {
  const hash = sourceHash();
  if (buildIsCurrent(hash)) {
    say("build is up to date");
    return;
  }
  say("building the web app (next build)…");
  const code = await run(bin("next"), ["build"], env);
  if (code !== 0) throw new LocalDatabaseError("next build failed; see its output above.");
  markBuilt(hash);
}

export async function startStack(options: StackOptions): Promise<Stack> {
  const { host, port, mqttPort } = options;
  if (!(await portIsFree(port, host))) {
    throw new LocalDatabaseError(`Port ${port} on ${host} is in use (another npm start?). Stop it, or choose another with PORT.`);
  }
  const url = options.env?.BETTER_AUTH_URL ?? process.env.BETTER_AUTH_URL ?? `http://${host}:${port}`;
  const mqttUrl = options.mqttUrl ?? `mqtt://127.0.0.1:${mqttPort}`;
  const deviceSecretsFile = options.deviceSecretsFile ?? DEVICE_SECRETS_FILE;
  await prepareDatabase(options.databaseUrl, options.historyDays, deviceSecretsFile);

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: "production",
    DATABASE_URL: options.databaseUrl,
    BETTER_AUTH_URL: url,
    BETTER_AUTH_SECRET: persistentSecret("auth-secret", process.env.BETTER_AUTH_SECRET),
    CLOCHE_MQTT_URL: mqttUrl,
    CLOCHE_MQTT_PORT: String(mqttPort),
    CLOCHE_MQTT_CONTROLLER_SECRET: persistentSecret("mqtt-controller-secret", process.env.CLOCHE_MQTT_CONTROLLER_SECRET),
    CLOCHE_MQTT_WEBAPP_SECRET: persistentSecret("mqtt-webapp-secret", process.env.CLOCHE_MQTT_WEBAPP_SECRET),
    CLOCHE_DEVICE_SECRETS: deviceSecretsFile,
    // Mail goes to the local sink, whose messages /dev/mail shows.
    CLOCHE_SMTP_URL: `smtp://127.0.0.1:${options.smtpPort}`,
    CLOCHE_MAIL_SINK_DIR: options.mailFolder,
    CLOCHE_MAIL_SINK_PORT: String(options.smtpPort),
    NEXT_TELEMETRY_DISABLED: "1",
    ...options.env,
  };
  await ensureBuilt(env);

  if (!(await portIsFree(options.smtpPort, host))) {
    throw new LocalDatabaseError(`Port ${options.smtpPort} on ${host} (the local mail sink) is in use. Choose another with CLOCHE_SMTP_PORT.`);
  }
  if (!options.mqttUrl && !(await portIsFree(mqttPort, host))) {
    throw new LocalDatabaseError(`Port ${mqttPort} on ${host} (the MQTT broker) is in use. Choose another with CLOCHE_MQTT_PORT.`);
  }

  const services: Supervisor[] = [];
  let stopping: Promise<void> | undefined;
  const stop = () =>
    (stopping ??= (async () => {
      for (const service of [...services].reverse()) await service.stop();
    })());

  // TypeScript entries run in one process each (`node --import tsx`, no tsx wrapper),
  // so the pid the supervisor watches is the service itself.
  const supervise = (name: string, command: string, args: string[], serviceEnv = env) =>
    superviseService({ name, command, args, env: serviceEnv, cwd: root }).then((service) => {
      services.push(service);
      void service.gaveUp.then(() => options.onGaveUp?.(name, services.every((s) => s.state === "given-up")));
      return service;
    });

  try {
    const controller = await supervise("controller", process.execPath, ["--import", "tsx", "controller/index.ts"]);
    // The simulated devices need the controller's broker to be listening when they start.
    const brokerUrl = new URL(mqttUrl);
    const brokerUp = await waitForPort(Number(brokerUrl.port || 1883), brokerUrl.hostname, 60_000, () => controller.state !== "given-up");
    if (!brokerUp) throw new LocalDatabaseError(`the MQTT broker at ${mqttUrl} did not answer within 60 s.`);
    await supervise("fakes", process.execPath, ["--import", "tsx", "fakes/index.ts"], { ...env, MQTT_URL: mqttUrl });
    const mailSink = await supervise("mail-sink", process.execPath, ["--import", "tsx", "fakes/mail-sink.ts"]);
    const sinkUp = await waitForPort(options.smtpPort, host, 30_000, () => mailSink.state !== "given-up");
    if (!sinkUp) say(`the mail sink did not answer on ${host}:${options.smtpPort}; invitations cannot be sent until it does.`);
    const web = await supervise("web", bin("next"), ["start", "--hostname", host, "--port", String(port)]);
    const ready = await waitForHttp(`${url}/api/health`, 60_000, () => web.state !== "given-up");
    if (!ready) throw new LocalDatabaseError("the web app did not answer /api/health within 60 s.");
  } catch (error) {
    await stop();
    throw error;
  }
  return { url, mqttUrl, env, services, stop };
}
