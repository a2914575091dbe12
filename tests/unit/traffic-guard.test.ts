import net from "node:net";
import { afterEach, describe, expect, it } from "vitest";
import { guardConnection, type GuardedPacket, type Verdict } from "@/controller/traffic-guard";
import { connectPacket, publishPacket, remainingLength } from "../support/raw-mqtt";

type Setup = { client: net.Socket; received: () => Buffer; judged: GuardedPacket[]; ended: Promise<void>; closed: Promise<void> };
const servers: net.Server[] = [];
afterEach(() => {
  for (const s of servers.splice(0)) s.close();
});

/** A server whose connections go through the guard; what passes is gathered. */
async function setup(judge: (p: GuardedPacket) => Verdict, connectMaxBytes = 1000): Promise<Setup> {
  let received = Buffer.alloc(0);
  const judged: GuardedPacket[] = [];
  let ended!: () => void;
  let closed!: () => void;
  const endedP = new Promise<void>((r) => (ended = r));
  const closedP = new Promise<void>((r) => (closed = r));
  const server = net.createServer((socket) => {
    const stream = guardConnection(socket, { connectMaxBytes, judge: (p) => (judged.push(p), judge(p)) });
    stream.on("data", (chunk: Buffer) => (received = Buffer.concat([received, chunk])));
    stream.on("end", ended);
    stream.on("close", closed);
    stream.on("error", () => {});
  });
  servers.push(server);
  await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
  const client = net.connect((server.address() as net.AddressInfo).port, "127.0.0.1");
  client.on("error", () => {});
  await new Promise((r) => client.once("connect", r));
  return { client, received: () => received, judged, ended: endedP, closed: closedP };
}

const pass = (): Verdict => ({ action: "pass" });
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("guardConnection", () => {
  it("passes every byte through unchanged, however the packets are cut, and reads the CONNECT's user name", async () => {
    const s = await setup(pass);
    const connect = connectPacket("site-a:sensor:air-1", "secret", "c1");
    const bytes = Buffer.concat([connect, publishPacket("t/a", "x".repeat(300)), publishPacket("t/b", "y", 1, 7)]);
    for (const byte of bytes) s.client.write(Buffer.from([byte]));
    s.client.end();
    await s.ended;
    expect(s.received().equals(bytes)).toBe(true);
    expect(s.judged).toEqual([
      { type: 1, remainingLength: connect.length - 2, username: "site-a:sensor:air-1" },
      // 2 + 3 bytes of topic and the payload; then topic, message id and payload.
      { type: 3, remainingLength: 305 },
      { type: 3, remainingLength: 8 },
    ]);
  });

  it("holds a packet back, and everything after it, for the time asked", async () => {
    let n = 0;
    const s = await setup((p) => (p.type === 3 && ++n === 2 ? { action: "hold", holdMs: 300 } : pass()));
    const first = publishPacket("t/a", "1");
    s.client.write(Buffer.concat([connectPacket("u", "p", "c"), first, publishPacket("t/a", "2"), publishPacket("t/a", "3")]));
    await sleep(150);
    // The first publish is through; the second and third wait.
    expect(s.received().subarray(-first.length).equals(first)).toBe(true);
    await sleep(300);
    expect(s.received().toString()).toContain("3");
  });

  it("closes on a verdict to close before the packet's body arrives", async () => {
    const s = await setup((p) => (p.type === 3 && p.remainingLength > 100 ? { action: "close" } : pass()));
    s.client.write(connectPacket("u", "p", "c"));
    s.client.write(Buffer.concat([Buffer.from([0x30]), remainingLength(10_000_000), Buffer.from("only the start")]));
    await s.closed;
    expect(s.received().toString()).not.toContain("only the start");
  });

  it("drops a CONNECT longer than allowed, asking the judge, without reading it whole", async () => {
    const s = await setup(() => ({ action: "close" }), 100);
    s.client.write(Buffer.from([0x10, ...remainingLength(5000)]));
    await s.closed;
    expect(s.judged).toEqual([{ type: 1, remainingLength: 5000 }]);
    expect(s.received().length).toBe(0);
  });

  it("answers a refused sign-in with CONNACK “server unavailable” and closes", async () => {
    const s = await setup(() => ({ action: "refuse" }));
    const answer = new Promise<Buffer>((r) => s.client.once("data", r));
    s.client.write(connectPacket("site-a:sensor:air-1", "p", "c"));
    expect([...(await answer)]).toEqual([0x20, 0x02, 0x00, 0x03]);
    await s.closed;
  });
});
