import "server-only";
import { getDb } from "@/db/client";
import { alertPreferences } from "@/db/schema";
import type { AlertPreferences } from "@/lib/alerts/preferences";
import { recordAudit } from "./audit";
import type { AlertRecipient } from "./alert-preferences";

/** Saves a member's own alert e-mails in the site, audited with before/after. */
export async function saveMemberAlertPreferences({
  siteId,
  member,
  preferences,
}: {
  siteId: string;
  member: AlertRecipient;
  preferences: AlertPreferences;
}): Promise<AlertPreferences> {
  const values = { kinds: preferences.kinds, quietFrom: preferences.quietFrom, quietUntil: preferences.quietUntil, dailySummary: preferences.dailySummary };
  await getDb().transaction(async (tx) => {
    await tx
      .insert(alertPreferences)
      .values({ siteId, userId: member.userId, ...values })
      .onDuplicateKeyUpdate({ set: values });
    await recordAudit(tx, {
      siteId,
      userId: member.userId,
      action: "alert_preferences.update",
      entityType: "alert_preferences",
      entityId: member.userId,
      before: { name: member.name, ...member.preferences },
      after: { name: member.name, ...values },
    });
  });
  return values;
}
