import "server-only";
import { and, asc, eq, inArray, ne } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb, getPool } from "@/db/client";
import { loadTariffs, refreshSiteEnergyDays } from "@/db/energy-days";
import { sites, tariffRates, tariffs } from "@/db/schema";
import { dayOf } from "@/lib/energy/calendar";
import type { Tariff } from "@/lib/energy/tariff";
import { AppError } from "@/lib/errors";
import type { TariffInput } from "@/lib/schemas/tariff";
import { describeDays } from "@/lib/schedules/week";
import { currentTariffId, daysToRefresh, describeValidity, overlappingTariff, type Validity } from "@/lib/tariffs/validity";
import { recordAudit } from "./audit";
import type { Tx } from "./site-lock";

/** A tariff as the pages and the API give it: rate times as HH:MM. */
export type TariffView = TariffInput & { id: string };

const hhmm = (clock: string) => clock.slice(0, 5);

function toView(t: Tariff): TariffView {
  return {
    id: t.id,
    name: t.name,
    kind: t.kind,
    validFrom: t.validFrom,
    validUntil: t.validUntil,
    standingChargePerDay: t.standingChargePerDay,
    taxPercent: t.taxPercent,
    rates: t.rates.map((r) => ({ label: r.label, startsAt: hhmm(r.startsAt), endsAt: hhmm(r.endsAt), days: [...r.days], pricePerKwh: r.pricePerKwh })),
  };
}

/** The site's tariffs, newest first, today's date in the site's zone and the tariff in force on it. */
export async function getTariffsBySite({ siteId, timeZone, now = new Date() }: { siteId: string; timeZone: string; now?: Date }) {
  const stored = await loadTariffs(getPool(), siteId);
  const today = dayOf(now.getTime(), timeZone);
  return { tariffs: stored.map(toView).reverse(), currentTariffId: currentTariffId(stored, today), today };
}

export async function requireTariff({ siteId, tariffId }: { siteId: string; tariffId: string }): Promise<TariffView> {
  const found = (await loadTariffs(getPool(), siteId)).find((t) => t.id === tariffId);
  if (!found) throw new AppError("not_found", "No such tariff in this site.");
  return toView(found);
}

/** A tariff as the audit trail keeps it: its rates in words. */
function audited(t: TariffInput) {
  return {
    name: t.name,
    kind: t.kind,
    validFrom: t.validFrom,
    validUntil: t.validUntil,
    standingChargePerDay: t.standingChargePerDay,
    taxPercent: t.taxPercent,
    rates: t.rates.map((r) => `${r.label} ${r.startsAt}–${r.endsAt} ${describeDays(r.days)} at ${r.pricePerKwh}/kWh`),
  };
}

/**
 * Under the site's row lock (so two saves at once are judged one after the other),
 * refuses dates that share a day with another of the site's tariffs.
 */
async function assertNoOverlap(tx: Tx, siteId: string, input: Validity, exceptId: string | null) {
  await tx.select({ id: sites.id }).from(sites).where(eq(sites.id, siteId)).for("update");
  const others = await tx
    .select({ id: tariffs.id, name: tariffs.name, validFrom: tariffs.validFrom, validUntil: tariffs.validUntil })
    .from(tariffs)
    .where(exceptId ? and(eq(tariffs.siteId, siteId), ne(tariffs.id, exceptId)) : eq(tariffs.siteId, siteId))
    .orderBy(asc(tariffs.validFrom));
  const clash = overlappingTariff(input, others);
  if (clash) {
    const message = `These dates overlap “${clash.name}” (${describeValidity(clash)}). A site has one tariff on each day: give that one an end date first, or choose other dates.`;
    throw new AppError("conflict", message, { validFrom: message });
  }
}

/**
 * Makes the tariff's rates the ones given. A stored rate keeps its id (the roll-up and
 * the audit trail refer to it) when a rate of the same name is saved, else the next
 * unclaimed one is reused in list order; extra rates are added, the rest go.
 */
async function saveRates(tx: Tx, tariffId: string, rates: TariffInput["rates"]) {
  const stored = await tx
    .select({ id: tariffRates.id, label: tariffRates.label })
    .from(tariffRates)
    .where(eq(tariffRates.tariffId, tariffId))
    .orderBy(asc(tariffRates.startsAt), asc(tariffRates.id));
  const free = new Set(stored.map((r) => r.id));
  const claim = (id: string | undefined) => (id && free.delete(id) ? id : undefined);
  const byName = rates.map((r) => claim(stored.find((s) => free.has(s.id) && s.label.toLowerCase() === r.label.toLowerCase())?.id));
  const ids = byName.map((id) => id ?? claim([...free][0]) ?? null);
  const rows = rates.map((r, i) => ({ id: ids[i] ?? randomUUID(), tariffId, ...r, days: r.days.join(",") }));
  for (const [i, row] of rows.entries()) if (ids[i]) await tx.update(tariffRates).set(row).where(eq(tariffRates.id, row.id));
  const added = rows.filter((_, i) => !ids[i]);
  if (added.length) await tx.insert(tariffRates).values(added);
  if (free.size) await tx.delete(tariffRates).where(inArray(tariffRates.id, [...free]));
}

function tariffRow(input: TariffInput) {
  const { rates: _rates, ...row } = input;
  return row;
}

/**
 * Makes the roll-up of the days a change touches again, after its transaction has
 * committed (the roll-up is kept per tariff rate). A failure leaves the change in place
 * and is reported: a rebuild of the roll-up from the log (rebuildEnergyDays) repairs it.
 */
async function refreshAfter(siteId: string, before: Validity | null, after: Validity | null): Promise<boolean> {
  try {
    const [site] = await getDb().select({ zone: sites.timeZone }).from(sites).where(eq(sites.id, siteId));
    const instants: number[] = [];
    for (const table of ["switch_events", "meter_samples"]) {
      // Per plug, so each end is one look-up in the (plug_id, at) index, however long the log.
      const [[span]] = (await getPool().query(
        `SELECT MIN(first_at) AS first_at, MAX(last_at) AS last_at FROM (
           SELECT (SELECT MIN(at) FROM ${table} WHERE plug_id = p.id) AS first_at, (SELECT MAX(at) FROM ${table} WHERE plug_id = p.id) AS last_at
             FROM plugs p WHERE p.site_id = ?) ends`,
        [siteId],
      )) as unknown as [{ first_at: Date | null; last_at: Date | null }[]];
      if (span?.first_at && span.last_at) instants.push(span.first_at.getTime(), span.last_at.getTime());
    }
    const activity = site && instants.length ? { firstDay: dayOf(Math.min(...instants), site.zone), lastDay: dayOf(Math.max(...instants), site.zone) } : null;
    const days = daysToRefresh(before, after, activity);
    if (days) await refreshSiteEnergyDays(getDb(), { siteId, ...days });
    return true;
  } catch (error) {
    console.error("[cloche] the energy roll-up was not brought up to date after a tariff change", error);
    return false;
  }
}

export async function createTariff({ siteId, userId, input }: { siteId: string; userId: string; input: TariffInput }) {
  const id = randomUUID();
  await getDb().transaction(async (tx) => {
    await assertNoOverlap(tx, siteId, input, null);
    await tx.insert(tariffs).values({ id, siteId, ...tariffRow(input) });
    await saveRates(tx, id, input.rates);
    await recordAudit(tx, { siteId, userId, action: "tariff.create", entityType: "tariff", entityId: id, after: audited(input) });
  });
  const reportsUpdated = await refreshAfter(siteId, null, input);
  return { tariff: await requireTariff({ siteId, tariffId: id }), reportsUpdated };
}

/** Saves the tariff whole: its rates are replaced. */
export async function updateTariff({ siteId, userId, before, input }: { siteId: string; userId: string; before: TariffView; input: TariffInput }) {
  await getDb().transaction(async (tx) => {
    await assertNoOverlap(tx, siteId, input, before.id);
    const changed = await tx.update(tariffs).set(tariffRow(input)).where(and(eq(tariffs.id, before.id), eq(tariffs.siteId, siteId)));
    if (changed[0].affectedRows === 0) throw new AppError("not_found", "No such tariff in this site.");
    await saveRates(tx, before.id, input.rates);
    await recordAudit(tx, { siteId, userId, action: "tariff.update", entityType: "tariff", entityId: before.id, before: audited(before), after: audited(input) });
  });
  const reportsUpdated = await refreshAfter(siteId, before, input);
  return { tariff: await requireTariff({ siteId, tariffId: before.id }), reportsUpdated };
}

export async function deleteTariff({ siteId, userId, tariff }: { siteId: string; userId: string; tariff: TariffView }) {
  await getDb().transaction(async (tx) => {
    await tx.delete(tariffs).where(and(eq(tariffs.id, tariff.id), eq(tariffs.siteId, siteId)));
    await recordAudit(tx, { siteId, userId, action: "tariff.delete", entityType: "tariff", entityId: tariff.id, before: audited(tariff) });
  });
  return { reportsUpdated: await refreshAfter(siteId, tariff, null) };
}
