import "server-only";
// What a site's daily summary is made of: each house's coldest and warmest minute from
// the inside sensors' per-minute roll-up, the alerts open during the stretch, and the
// once-per-day record. Runtime, kWh and cost come from getEnergyReport (db/queries/energy.ts).
import { and, asc, desc, eq, gte, isNotNull, isNull, lt, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { alerts, dailySummaries, houses, readingMinutes, sensors } from "@/db/schema";
import type { AlertKind } from "@/lib/domain";
import { insertOutboxRows, type OutboxRow } from "./alert-outbox";

export type Extreme = { c: number; at: Date };

async function extreme(houseId: string, siteId: string, from: Date, to: Date, which: "min" | "max"): Promise<Extreme | null> {
  const value = which === "min" ? readingMinutes.tempMinC : readingMinutes.tempMaxC;
  const [row] = await getDb()
    .select({ c: value, at: readingMinutes.minute })
    .from(readingMinutes)
    .innerJoin(sensors, eq(sensors.id, readingMinutes.sensorId))
    .where(
      and(
        eq(sensors.siteId, siteId),
        eq(sensors.houseId, houseId),
        eq(sensors.placement, "inside"),
        gte(readingMinutes.minute, from),
        lt(readingMinutes.minute, to),
        isNotNull(value),
      ),
    )
    // The earliest minute wins a tie, so the time given is when it was first reached.
    .orderBy(which === "min" ? asc(value) : desc(value), asc(readingMinutes.minute))
    .limit(1);
  return row && row.c !== null ? { c: row.c, at: row.at } : null;
}

/** Each house of the site with its inside minimum and maximum over [from, to). */
export async function getHouseExtremesBySite({ siteId, from, to }: { siteId: string; from: Date; to: Date }) {
  const list = await getDb().select({ id: houses.id, name: houses.name }).from(houses).where(eq(houses.siteId, siteId)).orderBy(asc(houses.name));
  return Promise.all(
    list.map(async (h) => ({ ...h, min: await extreme(h.id, siteId, from, to, "min"), max: await extreme(h.id, siteId, from, to, "max") })),
  );
}

/** The site's alerts open at some moment of [from, to), oldest first. */
export async function getAlertsDuring({ siteId, from, to }: { siteId: string; from: Date; to: Date }) {
  return getDb()
    .select({ houseId: alerts.houseId, kind: alerts.kind, message: alerts.message, raisedAt: alerts.raisedAt, clearedAt: alerts.clearedAt })
    .from(alerts)
    .where(and(eq(alerts.siteId, siteId), lt(alerts.raisedAt, to), or(isNull(alerts.clearedAt), gte(alerts.clearedAt, from))))
    .orderBy(asc(alerts.raisedAt), asc(alerts.id)) as Promise<{ houseId: string | null; kind: AlertKind; message: string; raisedAt: Date; clearedAt: Date | null }[]>;
}

export async function hasDailySummary({ siteId, day }: { siteId: string; day: string }): Promise<boolean> {
  const [row] = await getDb()
    .select({ day: dailySummaries.day })
    .from(dailySummaries)
    .where(and(eq(dailySummaries.siteId, siteId), eq(dailySummaries.day, day)))
    .limit(1);
  return row !== undefined;
}

/**
 * Records the site's summary for the day and writes its e-mails, in one transaction;
 * false (and nothing written) when that day's summary was already recorded.
 */
export async function recordDailySummary({ siteId, day, rows, now }: { siteId: string; day: string; rows: OutboxRow[]; now: Date }): Promise<boolean> {
  try {
    await getDb().transaction(async (tx) => {
      await tx.insert(dailySummaries).values({ siteId, day, composedAt: now, recipients: rows.length });
      await insertOutboxRows(tx, rows, now);
    });
    return true;
  } catch (error) {
    // Another pass recorded this day first: its e-mails stand, these are not written.
    const code = (error as { cause?: { code?: string } }).cause?.code ?? (error as { code?: string }).code;
    if (code === "ER_DUP_ENTRY") return false;
    throw error;
  }
}
