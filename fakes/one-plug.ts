// One simulated plug in a process of its own, so that it can lose its power (SIGKILL)
// while the rest of the site carries on: the fault suite's "plug losing power".
//   DATABASE_URL, MQTT_URL, CLOCHE_DEVICE_SECRETS, CLOCHE_FAKES_SITE   as fakes/index.ts
//   CLOCHE_FAKES_PLUG      the plug's device id (required)
//   CLOCHE_PLUG_JOURNAL    file its journal is appended to (fakes/journal.ts)
import path from "node:path";
import { fileURLToPath } from "node:url";
import pino from "pino";
import { connect } from "../db/client";
import { deviceUsername } from "../lib/mqtt/credentials";
import { plugJournalWriter } from "./journal";
import { loadSiteLayout, readDeviceSecrets } from "./layout";
import { startPlugDevice } from "./plug-device";
import { SIMULATION_DEFAULTS } from "./simulation";

async function main() {
  const log = pino({ name: "cloche-one-plug", level: process.env.LOG_LEVEL ?? "info" });
  const device = process.env.CLOCHE_FAKES_PLUG;
  const databaseUrl = process.env.DATABASE_URL;
  if (!device || !databaseUrl) throw new Error("CLOCHE_FAKES_PLUG and DATABASE_URL are needed");
  const site = process.env.CLOCHE_FAKES_SITE || SIMULATION_DEFAULTS.site;
  const { db, pool } = connect(databaseUrl);
  const layout = await loadSiteLayout(db, site).finally(() => pool.end());
  const plug = layout.plugs.find((p) => p.deviceId === device);
  if (!plug) throw new Error(`site ${site} has no plug ${device}`);
  const secrets = await readDeviceSecrets(process.env.CLOCHE_DEVICE_SECRETS || SIMULATION_DEFAULTS.secretsFile);
  const password = secrets[deviceUsername(site, "plug", device)];
  if (!password) throw new Error(`no MQTT secret for plug ${device}`);
  const journalFile = process.env.CLOCHE_PLUG_JOURNAL;
  const plugDevice = await startPlugDevice({
    url: process.env.MQTT_URL || SIMULATION_DEFAULTS.mqttUrl,
    site,
    device,
    password,
    ratedW: plug.applianceWatts,
    failsafeOn: plug.failsafeOn,
    meters: plug.metersEnergy,
    reconnectPeriod: SIMULATION_DEFAULTS.reconnectPeriod,
    logger: log,
    journal: journalFile ? plugJournalWriter(journalFile) : undefined,
    onSwitch: (on, atMs, cause) => log.info({ on, at: new Date(atMs).toISOString(), cause }, "plug switched"),
  });
  log.info({ device }, "plug running");
  const stop = () => void plugDevice.close().then(() => process.exit(0));
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
