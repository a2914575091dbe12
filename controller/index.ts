// `npm run controller`: the controller with its embedded broker (or MQTT_URL's).
import pino from "pino";
import { createController } from "./controller";
import { controllerEnv, deviceLimitsFromEnv } from "./env";

const env = controllerEnv();
const logger = pino({ name: "controller", level: env.LOG_LEVEL });

const controller = await createController({
  databaseUrl: env.DATABASE_URL,
  mqttUrl: env.MQTT_URL,
  mqttPort: env.CLOCHE_MQTT_PORT,
  controllerSecret: env.CLOCHE_MQTT_CONTROLLER_SECRET,
  webappSecret: env.CLOCHE_MQTT_WEBAPP_SECRET,
  deviceLimits: deviceLimitsFromEnv(env),
  sites: env.CLOCHE_SITES?.split(",").map((s) => s.trim()).filter(Boolean),
  logger,
});
logger.info({ mqtt: controller.mqttUrl }, "controller running");

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, "stopping");
  await controller.close();
  process.exit(0);
}
process.on("SIGINT", () => void stop("SIGINT"));
process.on("SIGTERM", () => void stop("SIGTERM"));
