// A device that speaks MQTT 3.1.1 over a bare socket, for sending what a well-behaved
// client library would not: packets as fast as TCP takes them, or too large.
import net from "node:net";
import { once } from "node:events";

function field(value: string | Buffer) {
  const bytes = typeof value === "string" ? Buffer.from(value) : value;
  return Buffer.concat([Buffer.from([bytes.length >> 8, bytes.length & 0xff]), bytes]);
}

/** The remaining-length encoding of §2.2.3. */
export function remainingLength(n: number) {
  const out: number[] = [];
  do {
    let byte = n % 128;
    n = Math.floor(n / 128);
    if (n > 0) byte |= 0x80;
    out.push(byte);
  } while (n > 0);
  return Buffer.from(out);
}

export function connectPacket(username: string, password: string, clientId: string) {
  const body = Buffer.concat([field("MQTT"), Buffer.from([4, 0xc2, 0, 60]), field(clientId), field(username), field(password)]);
  return Buffer.concat([Buffer.from([0x10]), remainingLength(body.length), body]);
}

export function publishPacket(topic: string, payload: string | Buffer, qos: 0 | 1 = 0, messageId = 1) {
  const body = Buffer.concat([field(topic), qos ? Buffer.from([messageId >> 8, messageId & 0xff]) : Buffer.alloc(0), Buffer.from(payload)]);
  return Buffer.concat([Buffer.from([0x30 | (qos << 1)]), remainingLength(body.length), body]);
}

export type RawDevice = {
  socket: net.Socket;
  /** The CONNACK's return code (0 accepted, 3 server unavailable, 4/5 refused). */
  returnCode: number;
  closed: Promise<void>;
};

/** Opens a socket and signs in; resolves with the CONNACK's return code. */
export async function rawConnect(port: number, username: string, password: string, clientId: string): Promise<RawDevice> {
  const socket = net.connect({ host: "127.0.0.1", port, noDelay: true });
  const closed = new Promise<void>((resolve) => socket.once("close", () => resolve()));
  socket.on("error", () => {});
  await once(socket, "connect");
  socket.write(connectPacket(username, password, clientId));
  const connack = await new Promise<Buffer>((resolve, reject) => {
    let got = Buffer.alloc(0);
    const onData = (chunk: Buffer) => {
      got = Buffer.concat([got, chunk]);
      if (got.length >= 4) {
        socket.off("data", onData);
        resolve(got);
      }
    };
    socket.on("data", onData);
    void closed.then(() => reject(new Error("closed before a CONNACK")));
  });
  if (connack[0] !== 0x20) throw new Error(`expected a CONNACK, got ${connack.subarray(0, 4).toString("hex")}`);
  // Anything after it (PUBACKs) is read and dropped, so the broker is never held up by us.
  socket.on("data", () => {});
  return { socket, returnCode: connack[3]!, closed };
}

/**
 * Writes packets made by `next` as fast as the socket takes them (waiting only while
 * TCP pushes back) until `stop` is aborted or the socket closes. Resolves with how
 * many were written.
 */
export async function flood(device: RawDevice, next: (i: number) => Buffer, stop: AbortSignal) {
  let written = 0;
  let open = true;
  void device.closed.then(() => {
    open = false;
  });
  const stopped = new Promise<void>((resolve) => stop.addEventListener("abort", () => resolve(), { once: true }));
  while (open && !stop.aborted && !device.socket.destroyed) {
    const more = device.socket.write(next(written));
    written++;
    if (!more) {
      const drained = once(device.socket, "drain").catch(() => undefined);
      await Promise.race([drained, device.closed, stopped]);
    } else if (written % 500 === 0) {
      // Let the rest of this process (the controller under test) have a turn.
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
  return written;
}
