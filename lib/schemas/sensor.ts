import { z } from "zod";
import { SENSOR_PLACEMENTS } from "@/lib/domain";
import { recordId } from "./common";
import { deviceFields } from "./device";

/** Inside its house (the house's temperature) or outside (the site's outside temperature, for degree-days). */
const placement = z.enum(SENSOR_PLACEMENTS, { error: "Placement must be inside or outside" });

/** A new sensor; one added without a placement hangs inside its house. */
export const sensorSchema = z.object({ ...deviceFields, placement: placement.default("inside") });

/** A change to a sensor; its device id is fixed once added (its credentials and topics are named after it). */
export const sensorChangeSchema = z
  .object({ name: deviceFields.name, houseId: deviceFields.houseId, placement })
  .partial()
  .strict();

export const sensorParams = z.object({ siteId: recordId("site"), sensorId: recordId("sensor") });

export type SensorInput = z.infer<typeof sensorSchema>;
/** What the form holds before parsing (placement may be left out). */
export type SensorFormInput = z.input<typeof sensorSchema>;
export type SensorChange = z.infer<typeof sensorChangeSchema>;
