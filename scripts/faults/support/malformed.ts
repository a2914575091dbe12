// Payloads that break the device contract in every way a broken or hostile device
// might: not JSON, wrong types, NaN and Infinity, numbers out of range, missing and extra
// fields, binary garbage, text for numbers, another topic's shape, odd unicode, too big.
// Each one is checked against the contract before it is sent: a payload the contract
// accepts would be a mistake of this file, not a finding.
import { decode, presencePayload, readingPayload, reportPayload } from "../../../lib/mqtt/topics";

export type Channel = "reading" | "report" | "presence";

type Make = (i: number, now: string) => string | Buffer;

const garbage = (i: number, length: number) => {
  const bytes = Buffer.alloc(length);
  let x = (i * 2654435761) >>> 0;
  for (let k = 0; k < length; k++) {
    x = (x * 1103515245 + 12345) >>> 0;
    bytes[k] = x >>> 24;
  }
  return bytes;
};

const common: [string, Make][] = [
  ["empty", () => ""],
  ["not JSON", (i) => `temp=${i % 40}`],
  ["cut short", (_i, now) => `{"temp_c": 12.5, "at": "${now}"`],
  ["binary garbage", (i) => garbage(i, 8 + (i % 200))],
  ["NaN", (_i, now) => `{"temp_c": NaN, "on": NaN, "at": "${now}"}`],
  ["Infinity", (_i, now) => `{"temp_c": Infinity, "on": true, "watts": -Infinity, "at": "${now}"}`],
  ["array", (_i, now) => JSON.stringify([{ temp_c: 12, on: true, at: now }])],
  ["number", (i) => String(i)],
  ["null", () => "null"],
  ["unicode junk", () => '{"temp_c": "１２．５", "on": "✓", "at": "２０２６"}'],
  ["lone surrogate", () => '{"temp_c": "\\ud800", "on": "\\udfff", "at": "\\ud83d"}'],
  ["control characters", (_i, now) => `{"temp_c": "\u0000\u0001", "at": "${now}\u0000"}`],
  ["too big", (i) => JSON.stringify({ temp_c: 12, on: true, at: new Date().toISOString(), pad: "x".repeat(5000 + (i % 3000)) })],
  ["deep nesting", () => "[".repeat(5000) + "]".repeat(5000)],
  ["command shape", (i) => JSON.stringify({ id: `cmd-${i}`, on: true, lease_s: 900 })],
  ["wake shape", () => JSON.stringify({ reason: "override", plug: "glass-heater" })],
];

const reading: [string, Make][] = [
  ["temperature as text", (i, now) => JSON.stringify({ temp_c: `${10 + (i % 10)}`, at: now })],
  ["temperature huge", (_i, now) => JSON.stringify({ temp_c: 1e308, at: now })],
  ["temperature past the range", (i, now) => JSON.stringify({ temp_c: i % 2 ? 91 : -61, at: now })],
  ["humidity over 100", (_i, now) => JSON.stringify({ temp_c: 12, rh: 150, at: now })],
  ["battery negative", (_i, now) => JSON.stringify({ temp_c: 12, battery: -0.5, at: now })],
  ["no time", () => JSON.stringify({ temp_c: 12 })],
  ["no temperature", (_i, now) => JSON.stringify({ rh: 70, at: now })],
  ["time not ISO", () => JSON.stringify({ temp_c: 12, at: "yesterday at noon" })],
  ["time as a number", (i) => JSON.stringify({ temp_c: 12, at: 1_700_000_000_000 + i })],
  ["negative time", () => JSON.stringify({ temp_c: 12, at: -1 })],
  ["impossible date", () => JSON.stringify({ temp_c: 12, at: "2026-13-45T25:61:00Z" })],
  ["time without zone", () => JSON.stringify({ temp_c: 12, at: "2026-03-01T12:00:00" })],
  ["nested junk", (_i, now) => JSON.stringify({ temp_c: { value: 12, unit: "C" }, at: now, extra: { a: [1, { b: [null] }] } })],
  ["report on the reading topic", (_i, now) => JSON.stringify({ on: true, cmd: "x", at: now })],
];

const report: [string, Make][] = [
  ["on as text", (_i, now) => JSON.stringify({ on: "true", at: now })],
  ["on as a number", (i, now) => JSON.stringify({ on: i % 2, at: now })],
  ["no state", (_i, now) => JSON.stringify({ cmd: "x", at: now })],
  ["no time", () => JSON.stringify({ on: true, cmd: "x" })],
  ["negative time", () => JSON.stringify({ on: false, at: -86_400_000 })],
  ["time as a number", (i) => JSON.stringify({ on: true, at: Date.now() - i })],
  ["watts negative", (_i, now) => JSON.stringify({ on: true, watts: -5, at: now })],
  ["watts huge", (_i, now) => JSON.stringify({ on: true, watts: 1e300, at: now })],
  ["energy as text", (_i, now) => JSON.stringify({ on: true, wh: "12345", at: now })],
  ["command id too long", (_i, now) => JSON.stringify({ on: true, cmd: "c".repeat(65), at: now })],
  ["command id a number", (i, now) => JSON.stringify({ on: true, cmd: i, at: now })],
  ["nested junk", (_i, now) => JSON.stringify({ on: { state: true }, at: now, extra: [[[{}]]] })],
  ["reading on the report topic", (_i, now) => JSON.stringify({ temp_c: 12, rh: 70, at: now })],
];

const presence: [string, Make][] = [
  ["presence unknown word", () => '"maybe"'],
  ["presence as object", () => JSON.stringify({ online: true })],
  ["presence upper case", () => '"ONLINE"'],
  ["presence bare word", () => "online"],
];

const makers: Record<Channel, [string, Make][]> = {
  reading: [...common, ...reading],
  report: [...common, ...report],
  presence: [...common, ...presence],
};

const schemas = { reading: readingPayload, report: reportPayload, presence: presencePayload };

/** The i-th malformed payload for a channel, with the name of its kind. */
export function malformedPayload(channel: Channel, i: number): { kind: string; payload: string | Buffer } {
  const list = makers[channel];
  const [kind, make] = list[i % list.length]!;
  const payload = make(i, new Date().toISOString());
  if (decode(schemas[channel], payload).ok) throw new Error(`the "${kind}" payload for ${channel} is one the contract accepts`);
  return { kind, payload };
}

export function malformedKinds(channel: Channel) {
  return makers[channel].length;
}
