// The notifier: every pass it watches the controller's heartbeat ("control stopped"),
// turns alerts into e-mails in the outbox, writes the daily summaries that are due, and
// sends what is due. Only one notifier works at a time across processes (a MariaDB
// named lock, not waited for); a failing step is logged and the loop carries on.
import { getNotifierSites } from "@/db/queries/alert-outbox";
import { DEFAULT_RETRY_POLICY, type RetryPolicy } from "@/lib/alerts/retry";
import { env } from "@/lib/server/env";
import { sendMail, type Mail } from "@/lib/server/mail";
import { checkControlStopped } from "./control-stopped";
import { composeDailySummary } from "./daily-summary";
import { fanOutSite } from "./fan-out";
import { withNotifierLock } from "./lock";
import { sendDueMail, type SendResult } from "./send";

export type NotifierLogger = {
  info: (fields: object, message: string) => void;
  warn: (fields: object, message: string) => void;
  error: (fields: object, message: string) => void;
};

export type NotifierOptions = {
  /** Time between passes. */
  everyMs: number;
  now: () => Date;
  logger: NotifierLogger;
  /** A site whose controller has not beaten for this long gets a "control stopped" alert. */
  controllerSilentAfterMs: number;
  retry: RetryPolicy;
  /** Only these sites (tests keep to their own); all when absent. */
  siteIds?: readonly string[];
  /** The app's public address for links; BETTER_AUTH_URL when absent. */
  baseUrl?: string;
  send: (mail: Mail) => Promise<unknown>;
  /** Run passes on a timer (false: only when runOnce() is called). */
  loop: boolean;
};

export type PassReport = { sites: number; controlStopped: { raised: number; cleared: number }; written: number; summaries: number; sending: SendResult };

export type Notifier = {
  /** One pass now; null when another notifier holds the lock. */
  runOnce(): Promise<PassReport | null>;
  /** Stops the loop and waits for a pass under way; safe to call more than once. */
  close(): Promise<void>;
};

const line = (message: string, fields: object) => `[notifier] ${message} ${JSON.stringify(fields)}`;

const consoleLogger: NotifierLogger = {
  info: (fields, message) => console.log(line(message, fields)),
  warn: (fields, message) => console.warn(line(message, fields)),
  error: (fields, message) => console.error(line(message, fields)),
};

export const NOTIFIER_DEFAULTS: NotifierOptions = {
  everyMs: 30_000,
  now: () => new Date(),
  logger: consoleLogger,
  controllerSilentAfterMs: 60_000,
  retry: DEFAULT_RETRY_POLICY,
  send: sendMail,
  loop: true,
};

const describe = (error: unknown) => (error instanceof Error ? error.message : String(error));

export async function createNotifier(input: Partial<NotifierOptions> = {}): Promise<Notifier> {
  const options: NotifierOptions = { ...NOTIFIER_DEFAULTS, ...input, retry: { ...DEFAULT_RETRY_POLICY, ...input.retry } };
  const { logger } = options;
  if (!(options.everyMs >= 1000)) throw new RangeError("everyMs must be at least 1000 ms");
  const baseUrl = options.baseUrl ?? env().BETTER_AUTH_URL;
  const watchingSince = options.now();

  async function pass(): Promise<PassReport> {
    const now = options.now();
    const report: PassReport = { sites: 0, controlStopped: { raised: 0, cleared: 0 }, written: 0, summaries: 0, sending: { sent: 0, failed: 0, skipped: 0 } };
    const sites = await getNotifierSites({ siteIds: options.siteIds });
    report.sites = sites.length;
    for (const site of sites) {
      // Each step of each site on its own: one that fails does not keep the others from running.
      try {
        const change = await checkControlStopped(site, { now, silentAfterMs: options.controllerSilentAfterMs, watchingSince });
        if (change) report.controlStopped[change]++;
      } catch (error) {
        logger.error({ site: site.slug, error: describe(error) }, "could not check the controller's heartbeat");
      }
      try {
        report.written += await fanOutSite(site, { now, baseUrl, watchingSince });
      } catch (error) {
        logger.error({ site: site.slug, error: describe(error) }, "could not write alert e-mails");
      }
      try {
        const written = await composeDailySummary(site, { now, baseUrl });
        if (written !== null) {
          report.summaries++;
          report.written += written;
        }
      } catch (error) {
        logger.error({ site: site.slug, error: describe(error) }, "could not write the daily summary");
      }
    }
    report.sending = await sendDueMail({ now, retry: options.retry, send: options.send, siteIds: options.siteIds });
    if (report.written || report.sending.sent || report.sending.failed || report.controlStopped.raised || report.controlStopped.cleared) {
      logger.info(report, "alert e-mails");
    }
    return report;
  }

  let chain: Promise<unknown> = Promise.resolve();
  let timer: ReturnType<typeof setTimeout> | undefined;
  let closed = false;
  let closing: Promise<void> | undefined;

  function runOnce(): Promise<PassReport | null> {
    const run = chain.then(async () => (await withNotifierLock(pass))?.value ?? null);
    chain = run.catch(() => undefined);
    return run;
  }

  function schedule(delayMs: number) {
    if (closed) return;
    timer = setTimeout(() => {
      timer = undefined;
      runOnce()
        .catch((error) => logger.error({ error: describe(error) }, "pass failed; trying again at the next"))
        .finally(() => schedule(options.everyMs));
    }, delayMs);
    timer.unref?.();
  }

  if (options.loop) schedule(0);

  return {
    runOnce,
    close() {
      closing ??= (async () => {
        closed = true;
        if (timer) clearTimeout(timer);
        timer = undefined;
        await chain;
      })();
      return closing;
    },
  };
}
