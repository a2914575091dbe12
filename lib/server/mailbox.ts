// Reads what the local mail sink (fakes/mail-sink.ts) kept: one .eml file per message,
// parsed with mailparser. Used by the /dev/mail page and by the tests.
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";

export type MailSummary = { id: string; to: string[]; subject: string; receivedAt: Date };
export type MailMessage = MailSummary & { from: string; text: string; html: string | null };

const ID = /^\d{15}-[0-9a-f]{12}$/;

/** Message ids are file names the sink chose; anything else (a path, dots) names nothing. */
export function isMailId(id: string): boolean {
  return ID.test(id);
}

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(value) ? value : value ? [value] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? v.name)).filter(Boolean);
}

async function parse(folder: string, id: string): Promise<MailMessage> {
  const mail = await simpleParser(await readFile(path.join(folder, `${id}.eml`)));
  return {
    id,
    to: addresses(mail.to),
    from: mail.from?.text ?? "",
    subject: mail.subject ?? "(no subject)",
    receivedAt: new Date(Number(id.slice(0, 15))),
    text: mail.text ?? "",
    html: typeof mail.html === "string" ? mail.html : null,
  };
}

async function ids(folder: string): Promise<string[]> {
  try {
    return (await readdir(folder))
      .filter((name) => name.endsWith(".eml"))
      .map((name) => name.slice(0, -4))
      .filter(isMailId);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return [];
    throw error;
  }
}

/** The kept messages, newest first (at most `limit`). */
export async function listMail(folder: string, { limit = 200 }: { limit?: number } = {}): Promise<MailSummary[]> {
  const newest = (await ids(folder)).sort().reverse().slice(0, limit);
  return Promise.all(newest.map(async (id) => {
    const { to, subject, receivedAt } = await parse(folder, id);
    return { id, to, subject, receivedAt };
  }));
}

/** One message, or null when there is no such message. */
export async function readMail(folder: string, id: string): Promise<MailMessage | null> {
  if (!isMailId(id)) return null;
  try {
    return await parse(folder, id);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return null;
    throw error;
  }
}

/** The newest message to `address` that arrived after `since`, waiting up to `timeoutMs`. */
export async function waitForMail(
  folder: string,
  { to, since = new Date(0), timeoutMs = 5000 }: { to: string; since?: Date; timeoutMs?: number },
): Promise<MailMessage> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    for (const summary of await listMail(folder)) {
      if (summary.receivedAt < since) break;
      if (summary.to.some((a) => a.toLowerCase() === to.toLowerCase())) return (await readMail(folder, summary.id))!;
    }
    if (Date.now() > deadline) throw new Error(`no mail to ${to} arrived within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}
