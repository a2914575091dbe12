// Each member's own choice of alert e-mails in a site: which kinds, quiet hours (read in
// the site's time zone), and the daily summary. Frost risk always goes out, whatever is
// chosen and at any hour. One schema serves the form and its handler.
import { z } from "zod";
import { ALERT_KINDS, ALWAYS_SENT_ALERT_KINDS, type AlertKind } from "@/lib/domain";
import type { Role } from "@/lib/permissions";
import { timeOfDay } from "@/lib/schemas/common";

/** The kinds a member may choose (frost risk is not among them: it always goes). */
export const CHOOSABLE_ALERT_KINDS = ALERT_KINDS.filter((k) => !ALWAYS_SENT_ALERT_KINDS.includes(k)) as Exclude<AlertKind, "too_cold">[];

export const alertPreferencesSchema = z
  .object({
    kinds: z
      .array(z.enum(CHOOSABLE_ALERT_KINDS, { error: "Unknown alert kind" }), { error: "Kinds must be a list" })
      .max(CHOOSABLE_ALERT_KINDS.length)
      .transform((kinds) => [...new Set(kinds)]),
    /** Both set, or both null (no quiet hours). Start after end runs over midnight (22:00–07:00). */
    quietFrom: timeOfDay("Quiet hours start").nullable(),
    quietUntil: timeOfDay("Quiet hours end").nullable(),
    dailySummary: z.boolean({ error: "Daily summary must be yes or no" }),
  })
  .superRefine((p, ctx) => {
    if ((p.quietFrom === null) !== (p.quietUntil === null)) {
      ctx.addIssue({ code: "custom", path: [p.quietFrom === null ? "quietFrom" : "quietUntil"], message: "Give both ends of the quiet hours, or neither" });
    } else if (p.quietFrom !== null && p.quietFrom === p.quietUntil) {
      ctx.addIssue({ code: "custom", path: ["quietUntil"], message: "Quiet hours must end at another time than they start" });
    }
  });

export type AlertPreferences = z.infer<typeof alertPreferencesSchema>;

/**
 * What a member gets before choosing: those who run the houses hear of everything;
 * a helper of what needs someone on the spot; a viewer (reports only) of nothing but
 * frost risk and the daily summary is off for all but the owner.
 */
export function defaultAlertPreferences(role: Role): AlertPreferences {
  const onTheSpot: AlertPreferences["kinds"] = ["too_warm", "too_hot", "controller_silent", "plug_offline", "heater_long_on"];
  switch (role) {
    case "owner":
      return { kinds: [...CHOOSABLE_ALERT_KINDS], quietFrom: null, quietUntil: null, dailySummary: true };
    case "grower":
      return { kinds: [...CHOOSABLE_ALERT_KINDS], quietFrom: null, quietUntil: null, dailySummary: false };
    case "helper":
      return { kinds: onTheSpot, quietFrom: null, quietUntil: null, dailySummary: false };
    case "viewer":
      return { kinds: [], quietFrom: null, quietUntil: null, dailySummary: false };
  }
}

/** Whether a member with these choices is sent alerts of this kind at all. */
export function receivesAlert(preferences: AlertPreferences, kind: AlertKind): boolean {
  return ALWAYS_SENT_ALERT_KINDS.includes(kind) || (preferences.kinds as AlertKind[]).includes(kind);
}
