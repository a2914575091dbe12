import { z } from "zod";

const schema = z.object({
  DATABASE_URL: z.string({ error: "DATABASE_URL is required" }).regex(/^mysql:\/\//, "DATABASE_URL must be a mysql:// URL"),
  MQTT_URL: z.string().regex(/^mqtts?:\/\//, "MQTT_URL must be an mqtt:// or mqtts:// URL").optional(),
  CLOCHE_MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(1886),
  CLOCHE_MQTT_CONTROLLER_SECRET: z.string({ error: "CLOCHE_MQTT_CONTROLLER_SECRET is required" }).min(16),
  CLOCHE_MQTT_WEBAPP_SECRET: z.string({ error: "CLOCHE_MQTT_WEBAPP_SECRET is required" }).min(16),
  CLOCHE_SITES: z.string().optional(),
  // The embedded broker's per-device limits (lib/mqtt/traffic-limit.ts has the defaults and why).
  CLOCHE_DEVICE_BURST: z.coerce.number().int().min(1).optional(),
  CLOCHE_DEVICE_PER_SECOND: z.coerce.number().positive().optional(),
  CLOCHE_DEVICE_CUT_AFTER_S: z.coerce.number().positive().optional(),
  CLOCHE_DEVICE_COOL_OFF_S: z.coerce.number().positive().optional(),
  CLOCHE_DEVICE_MAX_PACKET_BYTES: z.coerce.number().int().min(256).optional(),
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

/** The per-device limits the environment sets; the broker's defaults fill the rest. */
export function deviceLimitsFromEnv(env: ReturnType<typeof controllerEnv>) {
  const seconds = (s: number | undefined) => (s === undefined ? undefined : s * 1000);
  const limits = {
    burst: env.CLOCHE_DEVICE_BURST,
    perSecond: env.CLOCHE_DEVICE_PER_SECOND,
    cutAfterMs: seconds(env.CLOCHE_DEVICE_CUT_AFTER_S),
    coolOffMs: seconds(env.CLOCHE_DEVICE_COOL_OFF_S),
    maxPacketBytes: env.CLOCHE_DEVICE_MAX_PACKET_BYTES,
  };
  return Object.fromEntries(Object.entries(limits).filter(([, v]) => v !== undefined)) as Partial<Record<keyof typeof limits, number>>;
}
