// Why an e-mail did not go, as one plain sentence for the outbox's last_error (shown on
// the alerts page): never a stack trace or a server's raw dump.
import { AppError } from "@/lib/errors";

type SmtpFailure = { code?: string; originalCode?: string; responseCode?: number; response?: string; command?: string };

export function plainMailError(error: unknown): string {
  const cause = (error instanceof AppError && error.cause ? error.cause : error) as SmtpFailure & Error;
  // nodemailer reports socket trouble as ESOCKET and keeps the system's code beside it.
  const code = cause?.originalCode ?? cause?.code;
  if (code === "ECONNREFUSED") return "The mail server could not be reached (it refused the connection).";
  if (code === "ETIMEDOUT" || code === "ESOCKET" || code === "ECONNRESET" || code === "ECONNECTION") {
    return "The connection to the mail server failed or timed out.";
  }
  if (code === "EDNS" || code === "ENOTFOUND") return "The mail server's name could not be found; check CLOCHE_SMTP_URL.";
  if (code === "EAUTH") return "The mail server did not accept Cloche's sign-in; check the user and password in CLOCHE_SMTP_URL.";
  if (typeof cause?.responseCode === "number") {
    const said = (cause.response ?? "").split(/\r?\n/)[0]!.slice(0, 200);
    return `The mail server refused the message (${cause.responseCode}${said ? `: ${said}` : ""}).`;
  }
  if (error instanceof AppError) return error.message;
  return "The e-mail could not be sent.";
}

/** True when the server refused this one message (the next may still go); false when it could not be reached at all. */
export function refusedThisMessage(error: unknown): boolean {
  const cause = (error instanceof AppError && error.cause ? error.cause : error) as SmtpFailure;
  return typeof cause?.responseCode === "number" && cause.responseCode >= 500;
}
