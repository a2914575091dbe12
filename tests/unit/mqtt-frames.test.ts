// The broker's traffic guard reads each packet's length from its fixed header. Checked
// against the worked examples of the MQTT 3.1.1 specification (OASIS Standard,
// 29 October 2014), §2.2.3 "Remaining Length", Table 2.4 "Size of Remaining Length field".
import { describe, expect, it } from "vitest";
import { readFixedHeader } from "@/lib/mqtt/frames";

// Table 2.4: the smallest and largest value each number of length bytes can carry.
const TABLE_2_4: [number, number[]][] = [
  [0, [0x00]],
  [127, [0x7f]],
  [128, [0x80, 0x01]],
  [16_383, [0xff, 0x7f]],
  [16_384, [0x80, 0x80, 0x01]],
  [2_097_151, [0xff, 0xff, 0x7f]],
  [2_097_152, [0x80, 0x80, 0x80, 0x01]],
  [268_435_455, [0xff, 0xff, 0xff, 0x7f]],
];

describe("reading an MQTT fixed header", () => {
  it.each(TABLE_2_4)("reads a remaining length of %i as the specification encodes it", (length, bytes) => {
    // 0x30: PUBLISH, QoS 0 (§2.2.1).
    expect(readFixedHeader(Uint8Array.from([0x30, ...bytes]))).toEqual({ type: 3, remainingLength: length, headerLength: 1 + bytes.length });
  });

  it("waits for more bytes while the length is still arriving", () => {
    expect(readFixedHeader(Uint8Array.from([0x30]))).toBe("incomplete");
    expect(readFixedHeader(Uint8Array.from([0x30, 0x80, 0x80]))).toBe("incomplete");
  });

  it("calls a fifth length byte malformed (§2.2.3 allows four at most)", () => {
    expect(readFixedHeader(Uint8Array.from([0x30, 0xff, 0xff, 0xff, 0xff, 0x01]))).toBe("malformed");
  });

  it("reads a header part-way through a buffer", () => {
    expect(readFixedHeader(Uint8Array.from([0xc0, 0x00, 0x10, 0x80, 0x01]), 2)).toEqual({ type: 1, remainingLength: 128, headerLength: 3 });
  });
});
