import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { AppError } from "@/lib/errors";
import { env, isLoopbackSmtp } from "./env";

export type Mail = { to: string; subject: string; text: string; html?: string };

const holder = globalThis as unknown as { __clocheMail?: { url: string; transport: Transporter } };

function transport(url: string): Transporter {
  if (holder.__clocheMail?.url !== url) {
    holder.__clocheMail = {
      url,
      transport: nodemailer.createTransport({
        url,
        // The local sink speaks plain SMTP on loopback; a real server gets STARTTLS as usual.
        ignoreTLS: isLoopbackSmtp(url),
        connectionTimeout: 10_000,
        greetingTimeout: 10_000,
        socketTimeout: 20_000,
      }),
    };
  }
  return holder.__clocheMail.transport;
}

/**
 * Sends one message through the SMTP server of CLOCHE_SMTP_URL. Without one, or when
 * the server does not take the message, it throws a 503 AppError; callers that write
 * send inside their transaction so that a mail that did not go leaves nothing behind.
 */
export async function sendMail(mail: Mail): Promise<{ messageId: string }> {
  const e = env();
  if (!e.CLOCHE_SMTP_URL) {
    throw new AppError("unavailable", "E-mail is not set up on this server (CLOCHE_SMTP_URL), so nothing was sent.");
  }
  try {
    const info = await transport(e.CLOCHE_SMTP_URL).sendMail({ from: e.CLOCHE_MAIL_FROM, ...mail });
    return { messageId: info.messageId };
  } catch (error) {
    console.error("[cloche] mail not sent", error);
    const failure = new AppError("unavailable", "The e-mail could not be sent just now; nothing was changed. Please try again.");
    // Kept for callers that say why in their own words (the alert outbox's last_error).
    failure.cause = error;
    throw failure;
  }
}
