// An override as a person asks for it: the one schema of the phone form and its handler.
// Written with zod's small build ("zod/mini"): the form loads it on a phone, where the
// full build would weigh about as much as the rest of the page.
import * as z from "zod/mini";
import { MAX_REASON_LENGTH, OVERRIDE_DURATIONS } from "../override-durations";

/** A local date and time as a phone's date-time field gives it: "2026-03-01T14:30". */
const LOCAL_DATE_TIME = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])T([01]\d|2[0-3]):[0-5]\d$/;

export const overrideSchema = z
  .object({
    on: z.boolean({ error: "Choose on or off" }),
    duration: z.enum(OVERRIDE_DURATIONS, { error: "Choose how long: 30 min, 1 hour, 3 hours, until the schedule changes, or a time" }),
    /** With duration "until": the local time in the site's zone. */
    until: z.optional(
      z.string({ error: "The end time must be text" }).check(z.regex(LOCAL_DATE_TIME, "The end time must be a date and time such as 2026-03-01T14:30")),
    ),
    reason: z.optional(
      z
        .string({ error: "The reason must be text" })
        .check(z.trim(), z.maxLength(MAX_REASON_LENGTH, `The reason must be at most ${MAX_REASON_LENGTH} characters`)),
    ),
  })
  .check(
    z.superRefine((value, ctx) => {
      if (value.duration === "until" && !value.until) {
        ctx.addIssue({ code: "custom", path: ["until"], message: "Choose the time the override ends", input: value.until });
      }
      if (value.duration !== "until" && value.until !== undefined) {
        ctx.addIssue({ code: "custom", path: ["until"], message: "An end time goes only with “until a time I choose”", input: value.until });
      }
    }),
  );

export type OverrideInput = z.infer<typeof overrideSchema>;
