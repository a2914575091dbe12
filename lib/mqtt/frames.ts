// Reading MQTT 3.1.1 packets from raw bytes, only as far as the broker's traffic
// guard needs: where each packet starts and how long it is (§2.2), and who a CONNECT
// says it is (§3.1). Nothing here buffers a packet's body.

export const PACKET_CONNECT = 1;
export const PACKET_PUBLISH = 3;

export type FixedHeader = { type: number; remainingLength: number; headerLength: number };

/**
 * The fixed header at `offset`: "incomplete" when more bytes are needed, "malformed"
 * when the remaining length runs past four bytes (§2.2.3).
 */
export function readFixedHeader(buf: Uint8Array, offset = 0): FixedHeader | "incomplete" | "malformed" {
  if (buf.length - offset < 2) return "incomplete";
  const type = buf[offset]! >> 4;
  let remainingLength = 0;
  for (let i = 0; i < 4; i++) {
    const at = offset + 1 + i;
    if (at >= buf.length) return "incomplete";
    const byte = buf[at]!;
    remainingLength += (byte & 0x7f) * 128 ** i;
    if ((byte & 0x80) === 0) return { type, remainingLength, headerLength: 2 + i };
  }
  return "malformed";
}

/** CONNECT packet flags (§3.1.2.3). */
const USERNAME_FLAG = 0x80;
const WILL_FLAG = 0x04;

/**
 * The user name a whole CONNECT packet (fixed header included) signs in with; null
 * when it has none or the packet is not a well-formed CONNECT.
 */
export function connectUsername(packet: Uint8Array): string | null {
  const header = readFixedHeader(packet);
  if (typeof header === "string" || header.type !== PACKET_CONNECT) return null;
  const end = header.headerLength + header.remainingLength;
  if (packet.length < end) return null;
  let at = header.headerLength;
  const field = (): Uint8Array | null => {
    if (at + 2 > end) return null;
    const length = (packet[at]! << 8) | packet[at + 1]!;
    if (at + 2 + length > end) return null;
    const value = packet.subarray(at + 2, at + 2 + length);
    at += 2 + length;
    return value;
  };
  if (!field()) return null; // protocol name
  if (at + 4 > end) return null;
  const flags = packet[at + 1]!;
  at += 4; // protocol level, flags, keep-alive
  if (!field()) return null; // client id (may be empty, but must be there)
  if (flags & WILL_FLAG && (!field() || !field())) return null; // will topic and message
  if (!(flags & USERNAME_FLAG)) return null;
  const username = field();
  return username ? new TextDecoder().decode(username) : null;
}
