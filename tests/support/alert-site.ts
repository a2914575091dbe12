// A site of its own for the alert e-mail tests: a house, members of each role with
// their own e-mail addresses, and helpers to insert alerts and read the outbox.
import { randomUUID } from "node:crypto";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { alertPreferences, alerts, houses, memberships, outboundMail, sites, user, userSettings } from "@/db/schema";
import type { AlertDetail } from "@/lib/alerts/detail";
import type { AlertKind } from "@/lib/domain";
import type { Role } from "@/lib/permissions";

export type Member = { userId: string; email: string; name: string; role: Role };

type MemberSpec = { name: string; role: Role; unit?: "c" | "f"; quiet?: [string, string]; dailySummary?: boolean; kinds?: string[] };

export async function createAlertSite({ zone = "Europe/London", summaryTime = null as string | null, members }: { zone?: string; summaryTime?: string | null; members: MemberSpec[] }) {
  const db = getDb();
  const tag = randomUUID().slice(0, 8);
  const siteId = randomUUID();
  const houseId = randomUUID();
  const slug = `alerts-${tag}`;
  await db.insert(sites).values({ id: siteId, slug, name: `Fern Hollow ${tag}`, timeZone: zone, currency: "GBP", summaryTime });
  await db.insert(houses).values({ id: houseId, siteId, name: "Long house", kind: "glasshouse", lengthM: 6, widthM: 3, eaveHeightM: 2, ridgeHeightM: 3, glazing: "single_glass", highLimitC: 30 });
  const list: Member[] = [];
  for (const spec of members) {
    const userId = randomUUID();
    const email = `${spec.name.toLowerCase()}-${tag}@test.example`;
    await db.insert(user).values({ id: userId, name: spec.name, email, emailVerified: true });
    await db.insert(memberships).values({ id: randomUUID(), siteId, userId, role: spec.role });
    if (spec.unit) await db.insert(userSettings).values({ userId, temperatureUnit: spec.unit });
    if (spec.quiet || spec.dailySummary !== undefined || spec.kinds) {
      const all = ["too_warm", "too_hot", "controller_silent", "plug_offline", "heater_long_on", "sensor_quiet", "condensation"];
      await db.insert(alertPreferences).values({
        siteId,
        userId,
        kinds: spec.kinds ?? all,
        quietFrom: spec.quiet?.[0] ?? null,
        quietUntil: spec.quiet?.[1] ?? null,
        dailySummary: spec.dailySummary ?? false,
      });
    }
    list.push({ userId, email, name: spec.name, role: spec.role });
  }
  return { siteId, houseId, slug, name: `Fern Hollow ${tag}`, members: list };
}

export async function insertAlert(
  { siteId, houseId }: { siteId: string; houseId: string | null },
  { kind, raisedAt, message = "Something to look at.", detail = {} }: { kind: AlertKind; raisedAt: Date; message?: string; detail?: AlertDetail },
): Promise<number> {
  const [row] = await getDb().insert(alerts).values({ siteId, houseId, kind, message, detail, raisedAt }).$returningId();
  return row!.id;
}

export async function clearAlert(alertId: number, at: Date, clearedMessage = "Back within its limits.") {
  await getDb().update(alerts).set({ clearedAt: at, clearedMessage }).where(eq(alerts.id, alertId));
}

export async function outboxOf(siteId: string, alertId?: number) {
  return getDb()
    .select()
    .from(outboundMail)
    .where(alertId === undefined ? eq(outboundMail.siteId, siteId) : and(eq(outboundMail.siteId, siteId), eq(outboundMail.alertId, alertId)))
    .orderBy(asc(outboundMail.id));
}

/** A notifier logger that keeps test output quiet; warnings and errors still show. */
export const quietNotifierLogger = {
  info: () => undefined,
  warn: (fields: object, message: string) => console.warn(message, fields),
  error: (fields: object, message: string) => console.error(message, fields),
};
