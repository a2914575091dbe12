import "server-only";
import { and, desc, eq, ne } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { billPeriods } from "@/db/schema";
import { transactionWithRetry } from "@/db/transaction";
import { checkBill, type BillCheck } from "@/lib/bills/check";
import { dayOf } from "@/lib/energy/calendar";
import { AppError } from "@/lib/errors";
import { daysInPeriod, type Bill } from "@/lib/schemas/bill";
import { describeValidity } from "@/lib/tariffs/validity";
import { recordAudit } from "./audit";
import { getEnergyReport } from "./energy";
import type { Tx } from "./site-lock";

export type BillRow = { id: string; startsOn: string; endsOn: string; label: string | null; billedKwh: number | null; billedAmount: number | null };
export type BillWithCheck = BillRow & { days: number; check: BillCheck };

const columns = {
  id: billPeriods.id,
  startsOn: billPeriods.startsOn,
  endsOn: billPeriods.endsOn,
  label: billPeriods.label,
  billedKwh: billPeriods.billedKwh,
  billedAmount: billPeriods.billedAmount,
};

export async function getBillsBySite({ siteId }: { siteId: string }): Promise<BillRow[]> {
  return getDb().select(columns).from(billPeriods).where(eq(billPeriods.siteId, siteId)).orderBy(desc(billPeriods.startsOn), desc(billPeriods.endsOn));
}

export async function requireBill({ siteId, billId }: { siteId: string; billId: string }): Promise<BillRow> {
  const [row] = await getDb()
    .select(columns)
    .from(billPeriods)
    .where(and(eq(billPeriods.siteId, siteId), eq(billPeriods.id, billId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such bill in this site.");
  return row;
}

/** Today's date in a site's zone. */
export function siteToday(timeZone: string, now = new Date()): string {
  return dayOf(now.getTime(), timeZone);
}

/** Each bill beside heating's computed share of its dates (the energy report of those days). */
export async function getBillChecks({ siteId, now = new Date() }: { siteId: string; now?: Date }): Promise<BillWithCheck[]> {
  const bills = await getBillsBySite({ siteId });
  const checked: BillWithCheck[] = [];
  for (const bill of bills) {
    const { site, daysElapsed } = await getEnergyReport({ siteId, fromDay: bill.startsOn, toDay: bill.endsOn, bucket: "month", now });
    const days = daysInPeriod(bill.startsOn, bill.endsOn);
    const heating = {
      kwh: site.costedKwh,
      energyCost: site.cost,
      standingCharge: site.standingCharge,
      total: site.total,
      unpricedKwh: site.unpricedKwh,
      daysCounted: daysElapsed,
    };
    checked.push({ ...bill, days, check: checkBill(bill, heating, days) });
  }
  return checked;
}

const audited = (b: Pick<BillRow, "startsOn" | "endsOn" | "label" | "billedKwh" | "billedAmount">) => ({
  name: b.label ?? describeValidity({ validFrom: b.startsOn, validUntil: b.endsOn }),
  startsOn: b.startsOn,
  endsOn: b.endsOn,
  label: b.label,
  billedKwh: b.billedKwh,
  billedAmount: b.billedAmount,
});

/**
 * The stored bill with these dates, locked. Two saves of the same new dates at once meet
 * on InnoDB's gap lock; the deadlock victim is run again (transactionWithRetry) and then
 * finds the other's row.
 */
async function billWithDates(tx: Tx, siteId: string, bill: Pick<Bill, "startsOn" | "endsOn">, exceptId: string | null) {
  const [row] = await tx
    .select(columns)
    .from(billPeriods)
    .where(
      and(
        eq(billPeriods.siteId, siteId),
        eq(billPeriods.startsOn, bill.startsOn),
        eq(billPeriods.endsOn, bill.endsOn),
        ...(exceptId ? [ne(billPeriods.id, exceptId)] : []),
      ),
    )
    .limit(1)
    .for("update");
  return row ?? null;
}

function sameDatesError(other: BillRow): AppError {
  const message = `There is already a bill for these dates${other.label ? ` (“${other.label}”)` : ""}: change that one instead.`;
  return new AppError("conflict", message, { startsOn: message });
}

export async function createBill({ siteId, userId, input }: { siteId: string; userId: string; input: Bill }) {
  const id = randomUUID();
  await transactionWithRetry(getDb(), async (tx) => {
    const other = await billWithDates(tx, siteId, input, null);
    if (other) throw sameDatesError(other);
    await tx.insert(billPeriods).values({ id, siteId, ...input });
    await recordAudit(tx, { siteId, userId, action: "bill.create", entityType: "bill", entityId: id, after: audited(input) });
  });
  return requireBill({ siteId, billId: id });
}

export async function updateBill({ siteId, userId, before, input }: { siteId: string; userId: string; before: BillRow; input: Bill }) {
  await transactionWithRetry(getDb(), async (tx) => {
    const other = await billWithDates(tx, siteId, input, before.id);
    if (other) throw sameDatesError(other);
    await tx.update(billPeriods).set(input).where(and(eq(billPeriods.id, before.id), eq(billPeriods.siteId, siteId)));
    await recordAudit(tx, { siteId, userId, action: "bill.update", entityType: "bill", entityId: before.id, before: audited(before), after: audited(input) });
  });
  return requireBill({ siteId, billId: before.id });
}

export async function deleteBill({ siteId, userId, bill }: { siteId: string; userId: string; bill: BillRow }) {
  await getDb().transaction(async (tx) => {
    await tx.delete(billPeriods).where(and(eq(billPeriods.id, bill.id), eq(billPeriods.siteId, siteId)));
    await recordAudit(tx, { siteId, userId, action: "bill.delete", entityType: "bill", entityId: bill.id, before: audited(bill) });
  });
}

const sameFigures = (a: BillRow, b: Bill) => a.label === b.label && a.billedKwh === b.billedKwh && a.billedAmount === b.billedAmount;

/**
 * Saves uploaded bills in one transaction: a bill whose dates are already stored
 * updates that row (so the same file twice changes nothing), the others are added.
 */
export async function importBills({ siteId, userId, bills }: { siteId: string; userId: string; bills: readonly Bill[] }) {
  const counts = { created: 0, updated: 0, unchanged: 0 };
  await transactionWithRetry(getDb(), async (tx) => {
    for (const bill of bills) {
      const input = { startsOn: bill.startsOn, endsOn: bill.endsOn, label: bill.label, billedKwh: bill.billedKwh, billedAmount: bill.billedAmount };
      const stored = await billWithDates(tx, siteId, input, null);
      if (stored && sameFigures(stored, input)) {
        counts.unchanged++;
      } else if (stored) {
        await tx.update(billPeriods).set(input).where(eq(billPeriods.id, stored.id));
        await recordAudit(tx, { siteId, userId, action: "bill.update", entityType: "bill", entityId: stored.id, before: audited(stored), after: audited(input) });
        counts.updated++;
      } else {
        const id = randomUUID();
        await tx.insert(billPeriods).values({ id, siteId, ...input });
        await recordAudit(tx, { siteId, userId, action: "bill.create", entityType: "bill", entityId: id, after: audited(input) });
        counts.created++;
      }
    }
  });
  return counts;
}
