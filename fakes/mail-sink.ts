// A local stand-in for an outgoing mail server: an SMTP server on loopback that takes
// every message (no TLS, no sign-in) and keeps it as an .eml file in a folder, where
// lib/server/mailbox.ts reads it for the /dev/mail page and the tests. `npm start` and `npm test` run one.
import { randomBytes } from "node:crypto";
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { SMTPServer } from "smtp-server";

export type MailSink = { port: number; url: string; folder: string; close(): Promise<void> };

/** Largest message kept, in bytes. */
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

/** A file name that sorts by arrival: time in ms, then a random part. */
function messageName(now: number) {
  return `${String(now).padStart(15, "0")}-${randomBytes(6).toString("hex")}`;
}

export async function startMailSink({ port, folder, host = "127.0.0.1" }: { port: number; folder: string; host?: string }): Promise<MailSink> {
  mkdirSync(folder, { recursive: true });
  const server = new SMTPServer({
    name: "cloche-mail-sink",
    banner: "Cloche's local mail sink: messages are kept, never delivered",
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", callback);
      stream.on("end", () => {
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error(`Message larger than ${MAX_MESSAGE_BYTES} bytes`), { responseCode: 552 }));
          return;
        }
        try {
          const name = messageName(Date.now());
          const temporary = path.join(folder, `.${name}.part`);
          // Written aside and renamed, so a reader never sees half a message.
          writeFileSync(temporary, Buffer.concat(chunks));
          renameSync(temporary, path.join(folder, `${name}.eml`));
          callback();
        } catch (error) {
          callback(error as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  // A client that misbehaves is its own problem, not the sink's.
  server.on("error", (error) => console.error(`[mail-sink] ${error.message}`));
  const actual = (server.server.address() as AddressInfo).port;
  let closing: Promise<void> | undefined;
  return {
    port: actual,
    url: `smtp://${host}:${actual}`,
    folder,
    close: () => (closing ??= new Promise<void>((resolve) => server.close(() => resolve()))),
  };
}

async function main() {
  const port = Number(process.env.CLOCHE_MAIL_SINK_PORT ?? 2525);
  const folder = process.env.CLOCHE_MAIL_SINK_DIR;
  if (!folder) throw new Error("CLOCHE_MAIL_SINK_DIR must name the folder for the messages");
  const sink = await startMailSink({ port, folder });
  console.log(`mail sink listening on ${sink.url}; messages in ${folder}`);
  const stop = () => void sink.close().then(() => process.exit(0));
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error) => {
    console.error(`[mail-sink] ${error?.message ?? error}`);
    process.exit(1);
  });
}
