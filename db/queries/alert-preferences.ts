import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { alertPreferences, memberships, user } from "@/db/schema";
import { alertPreferencesSchema, defaultAlertPreferences, type AlertPreferences } from "@/lib/alerts/preferences";
import type { Role } from "@/lib/permissions";

export type AlertRecipient = {
  userId: string;
  name: string;
  email: string;
  role: Role;
  preferences: AlertPreferences;
  /** false while the member keeps the role's defaults (never saved a choice). */
  chosen: boolean;
};

type StoredRow = { kinds: unknown; quietFrom: string | null; quietUntil: string | null; dailySummary: boolean };

/** A stored choice read back; a row that no longer parses (a kind since removed) falls back to the role's defaults. */
function preferencesFrom(row: StoredRow | null, role: Role): { preferences: AlertPreferences; chosen: boolean } {
  if (!row) return { preferences: defaultAlertPreferences(role), chosen: false };
  const parsed = alertPreferencesSchema.safeParse({
    kinds: Array.isArray(row.kinds) ? row.kinds.filter((k) => typeof k === "string") : [],
    quietFrom: row.quietFrom,
    quietUntil: row.quietUntil,
    dailySummary: row.dailySummary,
  });
  return parsed.success ? { preferences: parsed.data, chosen: true } : { preferences: defaultAlertPreferences(role), chosen: false };
}

const columns = {
  userId: user.id,
  name: user.name,
  email: user.email,
  role: memberships.role,
  kinds: alertPreferences.kinds,
  quietFrom: alertPreferences.quietFrom,
  quietUntil: alertPreferences.quietUntil,
  dailySummary: alertPreferences.dailySummary,
};

function recipient(row: { userId: string; name: string; email: string; role: Role } & { [K in keyof StoredRow]: StoredRow[K] | null }): AlertRecipient {
  const stored = row.kinds === null ? null : { kinds: row.kinds, quietFrom: row.quietFrom, quietUntil: row.quietUntil, dailySummary: row.dailySummary ?? false };
  return { userId: row.userId, name: row.name, email: row.email, role: row.role, ...preferencesFrom(stored, row.role) };
}

/** Every member of the site with their alert e-mail choices (or their role's defaults). */
export async function getAlertRecipientsBySite({ siteId }: { siteId: string }): Promise<AlertRecipient[]> {
  const rows = await getDb()
    .select(columns)
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .leftJoin(alertPreferences, and(eq(alertPreferences.siteId, memberships.siteId), eq(alertPreferences.userId, memberships.userId)))
    .where(eq(memberships.siteId, siteId))
    .orderBy(user.name);
  return rows.map(recipient);
}

/** One member's choices in the site, or null when they are no member of it. */
export async function getMemberAlertPreferences({ siteId, userId }: { siteId: string; userId: string }): Promise<AlertRecipient | null> {
  const [row] = await getDb()
    .select(columns)
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .leftJoin(alertPreferences, and(eq(alertPreferences.siteId, memberships.siteId), eq(alertPreferences.userId, memberships.userId)))
    .where(and(eq(memberships.siteId, siteId), eq(memberships.userId, userId)))
    .limit(1);
  return row ? recipient(row) : null;
}
