import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { houseAlertRules, houses } from "@/db/schema";
import { storedAlertRules, type AlertRules } from "@/lib/alerts/rules";
import { AppError } from "@/lib/errors";
import { recordAudit } from "./audit";

export type HouseAlertRules = {
  houseId: string;
  name: string;
  /** The house's own frost limit, which the frost alert follows unless it has its own. */
  lowLimitC: number;
  rules: AlertRules;
  /** false while the house keeps the defaults (no row saved). */
  saved: boolean;
};

const columns = { houseId: houses.id, name: houses.name, lowLimitC: houses.lowLimitC, stored: houseAlertRules.rules };

function fromRow(row: { houseId: string; name: string; lowLimitC: number; stored: unknown }): HouseAlertRules {
  return { houseId: row.houseId, name: row.name, lowLimitC: row.lowLimitC, rules: storedAlertRules(row.stored), saved: row.stored !== null };
}

/** Every house of the site with its alert rules (the defaults where none are saved), by name. */
export async function getAlertRulesBySite({ siteId }: { siteId: string }): Promise<HouseAlertRules[]> {
  const rows = await getDb()
    .select(columns)
    .from(houses)
    .leftJoin(houseAlertRules, eq(houseAlertRules.houseId, houses.id))
    .where(eq(houses.siteId, siteId))
    .orderBy(asc(houses.name));
  return rows.map(fromRow);
}

/** One house's alert rules, the loader of its handlers: a house of another site is a 404. */
export async function getHouseAlertRules({ siteId, houseId }: { siteId: string; houseId: string }): Promise<HouseAlertRules> {
  const [row] = await getDb()
    .select(columns)
    .from(houses)
    .leftJoin(houseAlertRules, eq(houseAlertRules.houseId, houses.id))
    .where(and(eq(houses.id, houseId), eq(houses.siteId, siteId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such house in this site.");
  return fromRow(row);
}

/** Saves a house's rules whole, with the audit entry (before/after) in the same transaction. */
export async function saveHouseAlertRules({
  siteId,
  house,
  userId,
  rules,
}: {
  siteId: string;
  house: HouseAlertRules;
  userId: string;
  rules: AlertRules;
}): Promise<HouseAlertRules> {
  await getDb().transaction(async (tx) => {
    await tx
      .insert(houseAlertRules)
      .values({ houseId: house.houseId, rules, updatedBy: userId })
      .onDuplicateKeyUpdate({ set: { rules, updatedBy: userId } });
    await recordAudit(tx, {
      siteId,
      userId,
      action: "alert_rules.update",
      entityType: "alert_rules",
      entityId: house.houseId,
      before: { name: house.name, ...house.rules },
      after: { name: house.name, ...rules },
    });
  });
  return { ...house, rules, saved: true };
}
