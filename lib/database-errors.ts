// Errors that mean the database cannot be reached just now, as opposed to a statement
// it refused: the app answers those with 503 and "try again", never with 500.
export const DATABASE_TIMEOUT = "CLOCHE_DATABASE_TIMEOUT";

const UNREACHABLE_CODES = new Set([
  DATABASE_TIMEOUT,
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "EHOSTUNREACH",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_CON_COUNT_ERROR",
  "ER_SERVER_SHUTDOWN",
]);

export function isDatabaseUnreachable(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === "string" && UNREACHABLE_CODES.has(code)) return true;
    if (e instanceof Error && /closed state|connection is closed|Connection lost/i.test(e.message)) return true;
  }
  return false;
}


/**
 * For a log line: an unreachable database in one short sentence (its failed statement
 * and stack say nothing new on every retry); anything else as it is.
 */
export function logDetail(error: unknown): { reason: string } | { err: unknown } {
  if (!isDatabaseUnreachable(error)) return { err: error };
  let deepest: unknown = error;
  for (let e: unknown = error, depth = 0; e && typeof e === "object" && depth < 5; e = (e as { cause?: unknown }).cause, depth++) deepest = e;
  return { reason: deepest instanceof Error ? deepest.message : String(deepest) };
}
