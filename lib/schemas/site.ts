import { z } from "zod";
import { currency, line, recordId, timeZone } from "./common";

export const siteParams = z.object({ siteId: recordId("site") });

export const siteChangeSchema = z
  .object({
    name: line("Name", 120),
    timeZone,
    currency,
    mainsVoltage: z
      .number({ error: "Mains voltage must be a number" })
      .int("Mains voltage must be a whole number of volts")
      .min(100, "Mains voltage must be at least 100")
      .max(250, "Mains voltage must be at most 250"),
  })
  .partial();

export type SiteChange = z.infer<typeof siteChangeSchema>;
