// Sends what is due in the outbox. Each e-mail is claimed before it is sent, so two
// passes cannot send it twice; a failure is counted, explained in a sentence and tried
// again after a back-off (lib/alerts/retry.ts), and given up after a day.
import { claimMail, getDueMail, markMailFailed, markMailSent, markMailSkipped } from "@/db/queries/alert-outbox";
import { afterFailure, type RetryPolicy } from "@/lib/alerts/retry";
import type { Mail } from "@/lib/server/mail";
import { plainMailError, refusedThisMessage } from "./mail-error";

export const SKIPPED_AFTER_QUIET_HOURS =
  "Not sent: the alert was back to normal before your quiet hours ended. The back-to-normal message says what happened.";

/** How long a claimed e-mail stays out of reach should this process stop while sending it. */
const CLAIM_MS = 5 * 60_000;

export type SendResult = { sent: number; failed: number; skipped: number };

export async function sendDueMail({ now, retry, send, siteIds }: { now: Date; retry: RetryPolicy; send: (mail: Mail) => Promise<unknown>; siteIds?: readonly string[] }): Promise<SendResult> {
  const result: SendResult = { sent: 0, failed: 0, skipped: 0 };
  for (const mail of await getDueMail({ now, siteIds })) {
    if (mail.purpose === "alert_raised" && mail.status === "held" && mail.alertClearedAt !== null) {
      if (await markMailSkipped({ id: mail.id, reason: SKIPPED_AFTER_QUIET_HOURS })) result.skipped++;
      continue;
    }
    if (mail.waitsForOpening) continue;
    if (!(await claimMail({ id: mail.id, now, leaseUntil: new Date(now.getTime() + CLAIM_MS) }))) continue;
    try {
      await send({ to: mail.toAddress, subject: mail.subject, text: mail.bodyText, ...(mail.bodyHtml ? { html: mail.bodyHtml } : {}) });
      await markMailSent({ id: mail.id, at: now });
      result.sent++;
    } catch (error) {
      const next = afterFailure({ attempts: mail.attempts + 1, writtenAt: mail.createdAt, now }, retry);
      const reason = plainMailError(error);
      await markMailFailed({
        id: mail.id,
        error: next.giveUp ? `${reason} Given up after a day of tries.` : `${reason} Trying again in ${Math.round((next.retryAt.getTime() - now.getTime()) / 1000)} s.`,
        retryAt: next.giveUp ? null : next.retryAt,
      });
      result.failed++;
      // A server that cannot be reached will not take the rest either: they stay due for the next pass.
      if (!refusedThisMessage(error)) break;
    }
  }
  return result;
}
