import { z } from "zod";
import { recordId } from "./common";
import { deviceFields } from "./device";

export const sensorSchema = z.object(deviceFields);

/** A change to a sensor; its device id is fixed once added (its credentials and topics are named after it). */
export const sensorChangeSchema = sensorSchema.omit({ deviceId: true }).partial().strict();

export const sensorParams = z.object({ siteId: recordId("site"), sensorId: recordId("sensor") });

export type SensorInput = z.infer<typeof sensorSchema>;
export type SensorChange = z.infer<typeof sensorChangeSchema>;
