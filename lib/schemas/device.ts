import { z } from "zod";
import { SEGMENT, type DeviceKind } from "@/lib/mqtt/topics";
import { line, recordId } from "./common";

export const deviceKind = z.enum(["plug", "sensor"] satisfies DeviceKind[], { error: "kind must be plug or sensor" });

export const deviceParams = z.object({
  siteId: recordId("site"),
  kind: deviceKind,
  id: recordId("device"),
});

/** A device's id: the `{device}` segment of its MQTT topics, under the contract's segment rule. */
export const deviceIdField = z
  .string({ error: "Device id must be text" })
  .trim()
  .regex(SEGMENT, "Device id must be 1–64 lower-case letters, digits or dashes, starting and ending with a letter or digit");

/** What plugs and sensors share: a name, their id on the broker, their house. */
export const deviceFields = {
  name: line("Name", 80),
  deviceId: deviceIdField,
  houseId: recordId("house"),
};
