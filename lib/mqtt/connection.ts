// What someone configuring real hardware needs for one device: the topics of the
// device contract it uses, each with an example payload, built from the contract's own
// builders so that the page and the broker never disagree.
import { plugTopic, sensorTopic, type DeviceKind } from "./topics";

export type ContractTopic = {
  topic: string;
  /** What the device does with it. */
  role: "subscribe" | "publish" | "last will";
  what: string;
  qos: 0 | 1;
  retained: boolean;
  example: string;
};

const EXAMPLE_AT = "2026-01-15T06:30:00Z";

/** Topics of the contract (version 1) for one device, in the order a device meets them. */
export function deviceTopics(siteSlug: string, kind: DeviceKind, deviceId: string): ContractTopic[] {
  if (kind === "sensor") {
    return [
      {
        topic: sensorTopic(siteSlug, deviceId, "reading"),
        role: "publish",
        what: "Each reading: temperature in °C, relative humidity in %, battery from 0 to 1",
        qos: 1,
        retained: false,
        example: JSON.stringify({ temp_c: 12.4, rh: 81.5, battery: 0.92, at: EXAMPLE_AT }),
      },
    ];
  }
  return [
    {
      topic: plugTopic(siteSlug, deviceId, "command"),
      role: "subscribe",
      what: "Commands: switch on or off, echo the id, fall back to the fail-safe once the lease runs out",
      qos: 1,
      retained: false,
      example: JSON.stringify({ id: "c-0142", on: true, lease_s: 900 }),
    },
    {
      topic: plugTopic(siteSlug, deviceId, "report"),
      role: "publish",
      what: "Its state after every change and command, with the command id it obeyed",
      qos: 1,
      retained: true,
      example: JSON.stringify({ on: true, cmd: "c-0142", watts: 1980, wh: 12345, at: EXAMPLE_AT }),
    },
    {
      topic: plugTopic(siteSlug, deviceId, "presence"),
      role: "last will",
      what: "“online” on connecting; the broker sends “offline” as its last will",
      qos: 1,
      retained: true,
      example: JSON.stringify("online"),
    },
  ];
}
