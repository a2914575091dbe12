// `npm run fakes`: the demo site's simulated plugs and sensors, in real time or faster.
//   DATABASE_URL            where the site's houses, plugs and sensors are read
//   MQTT_URL                the broker (default mqtt://127.0.0.1:1886)
//   CLOCHE_DEVICE_SECRETS   JSON file { "<username>": "<secret>" } (default .data/device-secrets.json)
//   CLOCHE_FAKES_SPEED      simulated seconds per real second (default 1)
//   CLOCHE_FAKES_SITE       site slug (default fernhollow)
//   CLOCHE_PLUG_JOURNAL     file each plug appends its journal to (fakes/journal.ts; the fault suite)
//   CLOCHE_FAKES_EXCEPT     comma-separated device ids to leave out (run on their own by fakes/one-plug.ts)
import path from "node:path";
import { fileURLToPath } from "node:url";
import pino from "pino";
import { createSimulation, SIMULATION_DEFAULTS } from "./simulation";

export { createSimulation, SIMULATION_DEFAULTS, type Simulation, type SimulationOptions } from "./simulation";

async function main() {
  const log = pino({ name: "cloche-fakes", level: process.env.LOG_LEVEL ?? "info" });
  const speed = Number(process.env.CLOCHE_FAKES_SPEED ?? SIMULATION_DEFAULTS.speed);
  if (!Number.isFinite(speed) || speed <= 0) {
    log.error({ value: process.env.CLOCHE_FAKES_SPEED }, "CLOCHE_FAKES_SPEED must be a positive number");
    process.exit(2);
  }
  const sim = await createSimulation({
    databaseUrl: process.env.DATABASE_URL,
    mqttUrl: process.env.MQTT_URL || SIMULATION_DEFAULTS.mqttUrl,
    secretsFile: process.env.CLOCHE_DEVICE_SECRETS || SIMULATION_DEFAULTS.secretsFile,
    site: process.env.CLOCHE_FAKES_SITE || SIMULATION_DEFAULTS.site,
    speed,
    journalFile: process.env.CLOCHE_PLUG_JOURNAL || undefined,
    except: (process.env.CLOCHE_FAKES_EXCEPT ?? "").split(",").filter(Boolean),
    logger: log,
  });

  const every = setInterval(() => {
    for (const h of sim.layout.houses) {
      const s = sim.house(h.id);
      log.info({ house: h.name, airC: +s.airC.toFixed(2), rh: +s.rh.toFixed(1), heatW: Math.round(s.heatW), outsideC: +s.weather.outsideC.toFixed(2), sunWm2: Math.round(s.weather.solarWm2) }, "house");
    }
  }, 60_000);

  const stop = (signal: string) => {
    log.info({ signal }, "stopping");
    clearInterval(every);
    void sim.close().then(() => process.exit(0));
  };
  process.once("SIGINT", () => stop("SIGINT"));
  process.once("SIGTERM", () => stop("SIGTERM"));
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
