import { z } from "zod";
import { TEMPERATURE_UNITS } from "@/lib/domain";

/** A person's own settings. */
export const userSettingsSchema = z.object({
  temperatureUnit: z.enum(TEMPERATURE_UNITS, { error: "Temperature unit must be c or f" }),
});

export type UserSettingsInput = z.infer<typeof userSettingsSchema>;
