import { z } from "zod";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z
    .string({ error: "DATABASE_URL is required (npm start sets it for its own MariaDB)" })
    .regex(/^mysql:\/\//, "DATABASE_URL must be a mysql:// URL"),
  BETTER_AUTH_SECRET: z
    .string({ error: "BETTER_AUTH_SECRET is required (npm start makes one in .data/)" })
    .min(32, "BETTER_AUTH_SECRET must be at least 32 characters"),
  BETTER_AUTH_URL: z.url("BETTER_AUTH_URL must be the app's public URL").default("http://127.0.0.1:3000"),
  /** Further origins the browser may use, comma-separated. */
  CLOCHE_TRUSTED_ORIGINS: z.string().default(""),
  /** Sign-in attempts allowed per client address in each 60 s window. */
  CLOCHE_SIGN_IN_LIMIT: z.coerce.number().int().positive().default(5),
  /** The broker the controller listens on; the app publishes wake-ups there. */
  CLOCHE_MQTT_URL: z.string().regex(/^mqtts?:\/\//, "CLOCHE_MQTT_URL must be an mqtt:// URL").default("mqtt://127.0.0.1:1886"),
  /** The web app's MQTT secret; without it the app does not wake the controller (it still reloads every 30 s). */
  CLOCHE_MQTT_WEBAPP_SECRET: z.string().min(16).optional(),
  /** Where mail goes (smtp://[user:pass@]host:port, or smtps://); without it no mail is sent. */
  CLOCHE_SMTP_URL: z.string().regex(/^smtps?:\/\/[^/]+/, "CLOCHE_SMTP_URL must be an smtp:// or smtps:// URL").optional(),
  /** The sender of Cloche's mail. */
  CLOCHE_MAIL_FROM: z.string().min(3).default("Cloche <no-reply@cloche.localhost>"),
  /**
   * The local SMTP sink's folder (fakes/mail-sink.ts). Set by npm start and npm test
   * only; /dev/mail shows its messages and is a 404 without it.
   */
  CLOCHE_MAIL_SINK_DIR: z.string().min(1).optional(),
  /** "off" keeps this process from e-mailing alerts and summaries (instrumentation.ts). */
  /** The longest wait for one database statement (or a free connection) before a page or handler answers 503. */
  CLOCHE_DB_TIMEOUT_MS: z.coerce.number().int().min(100).max(120_000).default(5000),
  CLOCHE_NOTIFIER: z.enum(["on", "off"], { error: "CLOCHE_NOTIFIER must be on or off" }).default("on"),
}).refine((e) => !e.CLOCHE_MAIL_SINK_DIR || (e.CLOCHE_SMTP_URL !== undefined && isLoopbackSmtp(e.CLOCHE_SMTP_URL)), {
  path: ["CLOCHE_MAIL_SINK_DIR"],
  message: "CLOCHE_MAIL_SINK_DIR is for the local mail sink: CLOCHE_SMTP_URL must then point at 127.0.0.1, ::1 or localhost",
});

/** True for an SMTP server on this machine (the local sink); only those skip TLS. */
export function isLoopbackSmtp(url: string): boolean {
  try {
    return ["127.0.0.1", "localhost", "[::1]"].includes(new URL(url).hostname);
  } catch {
    return false;
  }
}

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

/** The validated environment. Read lazily so that `next build` needs no secrets. */
export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Cloche's environment is not valid:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}

export function trustedOrigins(e: Env = env()): string[] {
  const base = new URL(e.BETTER_AUTH_URL);
  const origins = new Set([base.origin]);
  // 127.0.0.1 and localhost are different origins to a browser: accept both locally.
  if (base.hostname === "127.0.0.1") origins.add(`${base.protocol}//localhost${base.port ? `:${base.port}` : ""}`);
  if (base.hostname === "localhost") origins.add(`${base.protocol}//127.0.0.1${base.port ? `:${base.port}` : ""}`);
  for (const origin of e.CLOCHE_TRUSTED_ORIGINS.split(",").map((s) => s.trim()).filter(Boolean)) origins.add(origin);
  return [...origins];
}
