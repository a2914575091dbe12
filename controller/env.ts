import { z } from "zod";

const schema = z.object({
  DATABASE_URL: z.string({ error: "DATABASE_URL is required" }).regex(/^mysql:\/\//, "DATABASE_URL must be a mysql:// URL"),
  MQTT_URL: z.string().regex(/^mqtts?:\/\//, "MQTT_URL must be an mqtt:// or mqtts:// URL").optional(),
  CLOCHE_MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(1886),
  CLOCHE_MQTT_CONTROLLER_SECRET: z.string({ error: "CLOCHE_MQTT_CONTROLLER_SECRET is required" }).min(16),
  CLOCHE_MQTT_WEBAPP_SECRET: z.string({ error: "CLOCHE_MQTT_WEBAPP_SECRET is required" }).min(16),
  CLOCHE_SITES: z.string().optional(),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace"]).default("info"),
});

export function controllerEnv(source: NodeJS.ProcessEnv = process.env) {
  const parsed = schema.safeParse(source);
  if (!parsed.success) {
    throw new Error(
      `The controller's environment is not valid:\n${parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n")}`,
    );
  }
  return parsed.data;
}
