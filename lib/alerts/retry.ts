// When an e-mail that did not go is tried again: 30 s after the first failure, doubling
// each time up to 15 min between tries, and given up a day after it was written to the
// outbox (a message held for quiet hours has its hold inside that day: holds end within 24 h).

export type RetryPolicy = { firstDelayMs: number; maxDelayMs: number; giveUpAfterMs: number };

export const DEFAULT_RETRY_POLICY: RetryPolicy = { firstDelayMs: 30_000, maxDelayMs: 15 * 60_000, giveUpAfterMs: 24 * 60 * 60_000 };

/** The wait before the next try after `attempts` failed tries (1 after the first failure). */
export function retryDelayMs(attempts: number, policy: RetryPolicy = DEFAULT_RETRY_POLICY): number {
  if (!Number.isInteger(attempts) || attempts < 1) throw new RangeError("attempts must be a whole number from 1");
  // 2^(attempts-1) overflows nothing: the exponent is capped once the maximum is reached.
  const doublings = Math.min(attempts - 1, 40);
  return Math.min(policy.firstDelayMs * 2 ** doublings, policy.maxDelayMs);
}

/**
 * What becomes of a message after a failed try at `now`: tried again at `retryAt`, or
 * given up once a day has passed since `writtenAt` (when it entered the outbox).
 */
export function afterFailure(
  { attempts, writtenAt, now }: { attempts: number; writtenAt: Date; now: Date },
  policy: RetryPolicy = DEFAULT_RETRY_POLICY,
): { giveUp: true } | { giveUp: false; retryAt: Date } {
  if (now.getTime() - writtenAt.getTime() >= policy.giveUpAfterMs) return { giveUp: true };
  return { giveUp: false, retryAt: new Date(now.getTime() + retryDelayMs(attempts, policy)) };
}
