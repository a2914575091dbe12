import { z } from "zod";
import { isWithinContinuousLoad } from "@/lib/control/electrical";
import { APPLIANCE_KINDS, DEFAULT_STALE_AFTER_S, FAILSAFE_MODES } from "@/lib/domain";
import { decimalNumber, recordId, seconds } from "./common";
import { deviceFields } from "./device";

// The outside-windows default and its frost band are edited with the plug's schedule,
// not here.
const plugFields = z.object({
  ...deviceFields,
  applianceKind: z.enum(APPLIANCE_KINDS, { error: `Appliance must be one of ${APPLIANCE_KINDS.join(", ")}` }),
  applianceWatts: z
    .number({ error: "Rated power must be a number" })
    .int("Rated power must be a whole number of watts")
    .min(1, "Rated power must be at least 1 W")
    .max(10_000, "Rated power must be at most 10000 W"),
  ratedCurrentA: decimalNumber("Plug rating", 1, 63).multipleOf(0.1, "Plug rating must be in tenths of an ampere"),
  metersEnergy: z.boolean({ error: "Meters energy must be true or false" }),
  sensorId: recordId("sensor").nullable(),
  failsafe: z.enum(FAILSAFE_MODES, { error: `Fail-safe must be one of ${FAILSAFE_MODES.join(", ")}` }),
  failsafeDutyPercent: z
    .number({ error: "On-for percent must be a number" })
    .int("On-for percent must be a whole percent")
    .min(1, "On-for percent must be at least 1 %")
    .max(99, "On-for percent must be at most 99 %")
    .nullable(),
  failsafeDutyPeriodS: seconds("Duty period", 60, 7200),
  staleAfterS: seconds("Quiet after", 60, 86_400),
  minOnS: seconds("Least time on", 0, 3600),
  minOffS: seconds("Least time off", 0, 3600),
  leaseS: seconds("Lease", 60, 86_400),
});

type DutyFields = { failsafe: string; failsafeDutyPercent: number | null };
const DUTY_RULE = { path: ["failsafeDutyPercent"], message: "On-for percent is required when the fail-safe is a duty cycle" };
const dutyGiven = (plug: DutyFields) => plug.failsafe !== "duty" || plug.failsafeDutyPercent != null;

/** A new plug; the usual settings unless given. */
export const plugSchema = plugFields
  .extend({
    metersEnergy: plugFields.shape.metersEnergy.default(false),
    sensorId: plugFields.shape.sensorId.default(null),
    failsafe: plugFields.shape.failsafe.default("off"),
    failsafeDutyPercent: plugFields.shape.failsafeDutyPercent.default(null),
    failsafeDutyPeriodS: plugFields.shape.failsafeDutyPeriodS.default(1200),
    staleAfterS: plugFields.shape.staleAfterS.default(DEFAULT_STALE_AFTER_S),
    minOnS: plugFields.shape.minOnS.default(180),
    minOffS: plugFields.shape.minOffS.default(180),
    leaseS: plugFields.shape.leaseS.default(900),
  })
  .refine(dutyGiven, DUTY_RULE);

/** A change to a plug; its device id is fixed once added. */
export const plugChangeSchema = plugFields.omit({ deviceId: true }).partial().strict();

export const plugParams = z.object({ siteId: recordId("site"), plugId: recordId("plug") });

export type PlugInput = z.infer<typeof plugSchema>;
export type PlugFormInput = z.input<typeof plugSchema>;
export type PlugChange = z.infer<typeof plugChangeSchema>;

/** The site's electrical settings the load rule needs. */
export type Mains = { mainsVoltage: number; continuousLoadPercent: number };

export const LOAD_RULE_FIELD = "applianceWatts";

export function loadMessage(mains: Mains): string {
  return `This appliance draws more than the plug may carry for hours (${mains.continuousLoadPercent} % of its rating at ${mains.mainsVoltage} V): use a plug and circuit rated for the load, or a smaller appliance`;
}

/**
 * The rules that tie a plug's fields together, checked on a new plug and on a change
 * merged with the stored plug: the duty cycle's percent, and the continuous-load check
 * (checkLoad's rule, with the site's mains voltage and margin), the same one the
 * controller's safety cut-out applies.
 */
export function plugRules(mains: Mains) {
  return z
    .object({
      applianceWatts: z.number(),
      ratedCurrentA: z.number(),
      failsafe: z.string(),
      failsafeDutyPercent: z.number().nullable(),
    })
    .refine(dutyGiven, DUTY_RULE)
    .refine((p) => isWithinContinuousLoad(p.applianceWatts, mains.mainsVoltage, p.ratedCurrentA, mains.continuousLoadPercent), {
      path: [LOAD_RULE_FIELD],
      message: loadMessage(mains),
    });
}

/** A new plug under the site's rules too: the form checks the load as the handler will. */
export function plugSchemaFor(mains: Mains) {
  const rules = plugRules(mains);
  return plugSchema.superRefine((plug, ctx) => {
    const checked = rules.safeParse(plug);
    if (checked.success) return;
    for (const issue of checked.error.issues) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
  });
}

/** A stored plug as the form edits it: its id and this schema's fields only (not the schedule's outside-windows default). */
export function plugFormValues<P extends PlugInput & { id: string }>(plug: P): PlugInput & { id: string } {
  const values = Object.fromEntries(Object.keys(plugFields.shape).map((key) => [key, plug[key as keyof PlugInput]]));
  return { ...(values as PlugInput), id: plug.id };
}
