// Stands between a device's socket and the broker: it reads each MQTT packet's fixed
// header as the bytes arrive, so a packet can be refused before its body is buffered,
// and a device can be held back by not reading its socket (TCP pushes back on it)
// while the broker and every other device go on.
import { Duplex } from "node:stream";
import type net from "node:net";
import { PACKET_CONNECT, connectUsername, readFixedHeader } from "@/lib/mqtt/frames";

export type Verdict =
  | { action: "pass" }
  /** Let the packet through after `holdMs`, reading nothing from the socket meanwhile. */
  | { action: "hold"; holdMs: number }
  /** Drop the connection at once. */
  | { action: "close" }
  /** Answer the CONNECT with "server unavailable" (MQTT 3.1.1 §3.2.2.3, code 3) and close. */
  | { action: "refuse" };

export type GuardedPacket = {
  type: number;
  remainingLength: number;
  /** A CONNECT only, once whole: the user name it signs in with. */
  username?: string | null;
};

export type GuardOptions = {
  /** A CONNECT longer than this is dropped before it is read. */
  connectMaxBytes: number;
  /** Called at each packet's fixed header (a CONNECT: once it is whole). */
  judge: (packet: GuardedPacket) => Verdict;
};

const SERVER_UNAVAILABLE = Buffer.from([0x20, 0x02, 0x00, 0x03]);

export function guardConnection(socket: net.Socket, options: GuardOptions): Duplex {
  let pending: Buffer = Buffer.alloc(0);
  /** Bytes of the current packet still to pass through unread. */
  let bodyLeft = 0;
  /** The packet at the front has been judged and may pass (its hold is over). */
  let admitted = false;
  let holding: NodeJS.Timeout | null = null;
  let wanting = true;
  let connected = false;
  /** The device has finished sending: what is left goes through, then the end. */
  let ended = false;
  let endPushed = false;

  const stream = new Duplex({
    read() {
      wanting = true;
      pump();
    },
    write(chunk: Buffer, _encoding, callback) {
      if (socket.write(chunk)) callback();
      else socket.once("drain", () => callback());
    },
    final(callback) {
      socket.end(callback);
    },
    destroy(error, callback) {
      if (holding) clearTimeout(holding);
      holding = null;
      socket.destroy(error ?? undefined);
      callback(error);
    },
  });

  function forward(bytes: Buffer) {
    if (!stream.push(bytes)) wanting = false;
  }

  function pump() {
    if (endPushed) return;
    while (!holding && (wanting || ended) && !stream.destroyed && pending.length) {
      if (bodyLeft > 0) {
        const n = Math.min(bodyLeft, pending.length);
        forward(pending.subarray(0, n));
        pending = pending.subarray(n);
        bodyLeft -= n;
        continue;
      }
      const header = readFixedHeader(pending);
      if (header === "incomplete") break;
      if (header === "malformed") return stream.destroy();
      const whole = header.headerLength + header.remainingLength;
      if (!admitted) {
        let verdict: Verdict;
        if (!connected) {
          // The first packet must be a CONNECT (§3.1); the broker sees to the rest.
          if (header.type !== PACKET_CONNECT) verdict = { action: "pass" };
          else if (header.remainingLength > options.connectMaxBytes) verdict = options.judge({ type: header.type, remainingLength: header.remainingLength });
          else if (pending.length < whole) break;
          else verdict = options.judge({ type: header.type, remainingLength: header.remainingLength, username: connectUsername(pending.subarray(0, whole)) });
          connected = true;
        } else {
          verdict = options.judge({ type: header.type, remainingLength: header.remainingLength });
        }
        if (verdict.action === "close") return stream.destroy();
        if (verdict.action === "refuse") {
          pending = Buffer.alloc(0);
          socket.pause();
          socket.end(SERVER_UNAVAILABLE);
          return;
        }
        if (verdict.action === "hold") {
          admitted = true;
          holding = setTimeout(() => {
            holding = null;
            pump();
          }, verdict.holdMs);
          break;
        }
      }
      admitted = false;
      bodyLeft = whole;
    }
    if (ended && !holding) {
      endPushed = true;
      stream.push(null);
    } else if (holding || !wanting) socket.pause();
    else socket.resume();
  }

  socket.on("data", (chunk: Buffer) => {
    pending = pending.length ? Buffer.concat([pending, chunk]) : chunk;
    pump();
  });
  socket.on("end", () => {
    ended = true;
    pump();
  });
  socket.on("error", (error) => stream.destroy(error));
  socket.on("close", () => stream.destroy());
  return stream;
}
