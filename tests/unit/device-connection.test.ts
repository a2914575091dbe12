// The connection details a page shows for a device: each topic is one the broker lets
// that device use in the way shown, and each example payload passes the contract's own schema.
import { describe, expect, it } from "vitest";
import { deviceUsername, mayPublish, maySubscribe, parseDeviceUsername } from "@/lib/mqtt/credentials";
import { deviceTopics } from "@/lib/mqtt/connection";
import { commandPayload, decode, parseTopic, presencePayload, readingPayload, reportPayload } from "@/lib/mqtt/topics";

const schemaOf = { command: commandPayload, report: reportPayload, presence: presencePayload, reading: readingPayload } as const;

describe.each([
  ["plug", "glass-heater", ["command", "report", "presence"]],
  ["sensor", "glass-air", ["reading"]],
] as const)("a %s's topics", (kind, device, channels) => {
  const topics = deviceTopics("fernhollow", kind, device);
  const who = parseDeviceUsername(deviceUsername("fernhollow", kind, device))!;

  it("are the contract's channels for that device", () => {
    expect(topics.map((t) => parseTopic(t.topic))).toEqual(channels.map((channel) => ({ site: "fernhollow", kind, device, channel })));
  });

  it("are allowed to the device for what the page says it does with them", () => {
    for (const t of topics) {
      if (t.role === "subscribe") expect(maySubscribe(who, t.topic)).toBe(true);
      else expect(mayPublish(who, t.topic)).toBe(true);
    }
  });

  it("carry example payloads the contract accepts", () => {
    for (const t of topics) {
      const channel = parseTopic(t.topic)!.channel as keyof typeof schemaOf;
      expect(decode(schemaOf[channel], t.example), t.topic).toMatchObject({ ok: true });
    }
  });
});

it("refuses a device id outside the topic rule", () => {
  expect(() => deviceTopics("fernhollow", "plug", "Glass Heater")).toThrow(/lower-case/);
});
