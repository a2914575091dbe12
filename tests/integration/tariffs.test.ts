// Tariffs and the bill check through their route handlers, on a site of the test's own
// with one 2 kW heater, against the real MariaDB.
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshEnergyDays } from "@/db/energy-days";
import { getEnergyReport } from "@/db/queries/energy";
import { auditLog, billPeriods, houses, plugs, switchEvents, tariffRates, tariffs } from "@/db/schema";
import { DEMO_MEMBERS, DEMO_SITE, demoId, seedDemo } from "@/db/seed";
import * as sitesRoute from "@/app/api/sites/route";
import * as tariffsRoute from "@/app/api/sites/[siteId]/tariffs/route";
import * as tariffRoute from "@/app/api/sites/[siteId]/tariffs/[tariffId]/route";
import * as billsRoute from "@/app/api/sites/[siteId]/bills/route";
import * as billRoute from "@/app/api/sites/[siteId]/bills/[billId]/route";
import * as uploadRoute from "@/app/api/sites/[siteId]/bills/upload/route";
import { call, signIn, signUp, type Account } from "../support/http";

const everyDay = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"];
const HEATER_W = 2000;

let owner: Account;
let siteId: string;
let plugId: string;

type Json = Record<string, unknown>;
const json = async (r: Response) => (await r.json()) as Json & { error?: { code: string; message: string; fields?: Record<string, string> } };
const post = (handler: unknown, path: string, params: Record<string, string>, body: unknown, cookie = owner.cookie) => call(handler, { method: "POST", path, params, body, cookie });
const put = (handler: unknown, params: Record<string, string>, body: unknown, cookie = owner.cookie) => call(handler, { method: "PUT", path: "/x", params, body, cookie });

/** Flat 0.20 /kWh, 0.50 a day, 5 % tax, from 2025-03-01 (before the heater's two days). */
const flat = {
  name: "Spring flat",
  kind: "flat",
  validFrom: "2025-03-01",
  validUntil: null as string | null,
  standingChargePerDay: 0.5,
  taxPercent: 5,
  rates: [{ label: "All day", startsAt: "00:00", endsAt: "00:00", days: everyDay, pricePerKwh: 0.2 }],
};

/** Time of use from 2025-03-11: 0.30 from 07:00 to 12:00, 0.15 from 12:00 to 07:00 (wrapping); 0.40 a day, 5 % tax. */
const timeOfUse = {
  name: "Peak and off-peak",
  kind: "time_of_use",
  validFrom: "2025-03-11",
  validUntil: null,
  standingChargePerDay: 0.4,
  taxPercent: 5,
  rates: [
    { label: "Peak", startsAt: "07:00", endsAt: "12:00", days: everyDay, pricePerKwh: 0.3 },
    { label: "Off-peak", startsAt: "12:00", endsAt: "07:00", days: everyDay, pricePerKwh: 0.15 },
  ],
};

async function reportOf(day: string) {
  return (await getEnergyReport({ siteId, fromDay: day, toDay: day, bucket: "day", now: new Date("2025-04-01T00:00:00Z") })).site;
}

beforeAll(async () => {
  await seedDemo(getDb());
  owner = await signUp({ siteName: "Tariff Terrace", timeZone: "Europe/London", currency: "GBP" });
  const sitesResponse = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  siteId = ((await sitesResponse.json()) as { sites: { id: string }[] }).sites[0]!.id;
  const houseId = randomUUID();
  plugId = randomUUID();
  const db = getDb();
  await db.insert(houses).values({ id: houseId, siteId, name: "Lean-to", kind: "glasshouse", lengthM: 3, widthM: 2, eaveHeightM: 2, ridgeHeightM: 2.5, glazing: "single_glass" });
  await db.insert(plugs).values({ id: plugId, siteId, houseId, deviceId: "heater-1", name: "Heater", applianceKind: "heater", applianceWatts: HEATER_W, ratedCurrentA: 13 });
});

describe("a tariff change", () => {
  it("makes the report use each tariff for its own dates, and each change is audited", async () => {
    const created = await post(tariffsRoute.POST, `/api/sites/${siteId}/tariffs`, { siteId }, flat);
    expect(created.status).toBe(201);
    const flatId = ((await json(created)).tariff as { id: string }).id;

    // The heater runs 10:00–14:00 on Monday 10 and Tuesday 11 March 2025 (London is on
    // GMT until 30 March, so local time is UTC), at its rated 2 kW: 8 kWh a day (kWh = kW × h).
    const db = getDb();
    const at = (iso: string) => new Date(iso);
    const log = [
      ["2025-03-10T10:00:00Z", true],
      ["2025-03-10T14:00:00Z", false],
      ["2025-03-11T10:00:00Z", true],
      ["2025-03-11T14:00:00Z", false],
    ] as const;
    await db.insert(switchEvents).values(
      log.map(([iso, on]) => ({ plugId, at: at(iso), fromOn: !on, toOn: on, cause: "schedule" as const, ratedWatts: HEATER_W, commandId: randomUUID() })),
    );
    await refreshEnergyDays(db, [{ plugId, fromMs: at(log[0][0]).getTime(), toMs: at(log[3][0]).getTime() }]);

    // Both days under the flat rate: 8 kWh × 0.20 × 1.05 = 1.68 each.
    expect((await reportOf("2025-03-11")).cost).toBeCloseTo(1.68, 9);

    // The flat tariff ends on the 10th; the time-of-use one starts on the 11th.
    const rateIds = async (tariffId: string) => (await db.select({ id: tariffRates.id }).from(tariffRates).where(eq(tariffRates.tariffId, tariffId))).map((r) => r.id);
    const flatRates = await rateIds(flatId);
    const ended = await put(tariffRoute.PUT, { siteId, tariffId: flatId }, { ...flat, validUntil: "2025-03-10" });
    expect(ended.status).toBe(200);
    // A saved rate keeps its id (the roll-up and the audit trail refer to it).
    expect(await rateIds(flatId)).toEqual(flatRates);
    const second = await post(tariffsRoute.POST, `/api/sites/${siteId}/tariffs`, { siteId }, timeOfUse);
    expect(second.status).toBe(201);
    const touId = ((await json(second)).tariff as { id: string }).id;

    const monday = await reportOf("2025-03-10");
    expect(monday.costedKwh).toBeCloseTo(8, 9);
    expect(monday.cost).toBeCloseTo(8 * 0.2 * 1.05, 9); // 1.68
    expect(monday.standingCharge).toBeCloseTo(0.5 * 1.05, 9);
    const tuesday = await reportOf("2025-03-11");
    // 10:00–12:00 peak, 12:00–14:00 off-peak: (4 × 0.30 + 4 × 0.15) × 1.05 = 1.89.
    expect(tuesday.costedKwh).toBeCloseTo(8, 9);
    expect(tuesday.cost).toBeCloseTo((4 * 0.3 + 4 * 0.15) * 1.05, 9);
    expect(tuesday.total).toBeCloseTo(1.89 + 0.4 * 1.05, 9);

    // Rates saved in another order keep their ids by name.
    const idsByLabel = async () => Object.fromEntries((await db.select().from(tariffRates).where(eq(tariffRates.tariffId, touId))).map((r) => [r.label, r.id]));
    const touRates = await idsByLabel();
    const reordered = await put(tariffRoute.PUT, { siteId, tariffId: touId }, { ...timeOfUse, rates: [...timeOfUse.rates].reverse() });
    expect(reordered.status).toBe(200);
    expect(await idsByLabel()).toEqual(touRates);

    // Removing the second tariff leaves Tuesday's heating without a price.
    const removed = await call(tariffRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, tariffId: touId }, cookie: owner.cookie });
    expect(removed.status).toBe(200);
    const bare = await reportOf("2025-03-11");
    expect(bare.unpricedKwh).toBeCloseTo(8, 9);
    expect(bare.cost).toBeNull();

    const trail = await db
      .select({ action: auditLog.action, entityId: auditLog.entityId, before: auditLog.before, after: auditLog.after })
      .from(auditLog)
      .where(and(eq(auditLog.siteId, siteId), eq(auditLog.entityType, "tariff")))
      .orderBy(auditLog.id);
    expect(trail.map((t) => [t.action, t.entityId])).toEqual([
      ["tariff.create", flatId],
      ["tariff.update", flatId],
      ["tariff.create", touId],
      ["tariff.update", touId],
      ["tariff.delete", touId],
    ]);
    expect(trail[1]!.before).toMatchObject({ name: "Spring flat", validUntil: null });
    expect(trail[1]!.after).toMatchObject({ validUntil: "2025-03-10", rates: ["All day 00:00–00:00 Every day at 0.2/kWh"] });

    // Put the time-of-use tariff back for the bill check below.
    expect((await post(tariffsRoute.POST, `/api/sites/${siteId}/tariffs`, { siteId }, timeOfUse)).status).toBe(201);
  });

  it("refuses dates that overlap another tariff, naming it, and changes nothing", async () => {
    const before = await getDb().select().from(tariffs).where(eq(tariffs.siteId, siteId));
    const clash = await post(tariffsRoute.POST, `/api/sites/${siteId}/tariffs`, { siteId }, { ...flat, name: "Clash", validFrom: "2025-03-05", validUntil: "2025-03-20" });
    expect(clash.status).toBe(409);
    const body = await json(clash);
    expect(body.error!.message).toBe(
      "These dates overlap “Spring flat” (1 Mar 2025 – 10 Mar 2025). A site has one tariff on each day: give that one an end date first, or choose other dates.",
    );
    expect(body.error!.fields!.validFrom).toBe(body.error!.message);
    // Editing a tariff is not judged against itself.
    const [flatRow] = before.filter((t) => t.name === "Spring flat");
    const again = await put(tariffRoute.PUT, { siteId, tariffId: flatRow!.id }, { ...flat, validUntil: "2025-03-10", name: "Spring flat" });
    expect(again.status).toBe(200);
    const openClash = await put(tariffRoute.PUT, { siteId, tariffId: flatRow!.id }, { ...flat, validUntil: null });
    expect(openClash.status).toBe(409);
    expect((await json(openClash)).error!.message).toContain("“Peak and off-peak” (from 11 Mar 2025, no end date)");
    expect(await getDb().select().from(tariffs).where(eq(tariffs.siteId, siteId))).toEqual(
      expect.arrayContaining(before.map((t) => expect.objectContaining({ id: t.id, validUntil: t.validUntil }))),
    );
  });

  it("answers bad input with 400 naming what is wrong, and writes nothing", async () => {
    const count = async () => (await getDb().select().from(tariffs).where(eq(tariffs.siteId, siteId))).length;
    const n = await count();
    const path = `/api/sites/${siteId}/tariffs`;
    const gap = await post(tariffsRoute.POST, path, { siteId }, { ...timeOfUse, validFrom: "2030-01-01", rates: [{ ...timeOfUse.rates[0], days: ["MO"] }, timeOfUse.rates[1]] });
    expect(gap.status).toBe(400);
    expect((await json(gap)).error!.fields!.rates).toContain("No rate covers Tuesday 07:00–12:00.");
    const reversed = await post(tariffsRoute.POST, path, { siteId }, { ...flat, validFrom: "2030-02-01", validUntil: "2030-01-01" });
    expect((await json(reversed)).error!.fields!.validUntil).toBe("Valid until must be on or after valid from");
    const badTime = await post(tariffsRoute.POST, path, { siteId }, { ...flat, validFrom: "2030-01-01", rates: [{ ...flat.rates[0], startsAt: "25:00" }] });
    expect(badTime.status).toBe(400);
    const asText = await post(tariffsRoute.POST, path, { siteId }, { ...flat, validFrom: "2030-01-01", standingChargePerDay: "0.5" });
    expect((await json(asText)).error!.fields!.standingChargePerDay).toBe("Standing charge must be a number");
    const notUuid = await call(tariffRoute.GET, { path: "/x", params: { siteId, tariffId: "nope" }, cookie: owner.cookie });
    expect(notUuid.status).toBe(400);
    expect(await count()).toBe(n);
  });
});

describe("the bill check", () => {
  it("shows heating's share beside the bill and what is left, warning when heating exceeds it", async () => {
    const path = `/api/sites/${siteId}/bills`;
    const bill = { startsOn: "2025-03-10", endsOn: "2025-03-11", label: "Two days", billedKwh: 30, billedAmount: 9.5 };
    const created = await post(billsRoute.POST, path, { siteId }, bill);
    expect(created.status).toBe(201);
    const billId = ((await json(created)).bill as { id: string }).id;
    const same = await post(billsRoute.POST, path, { siteId }, { ...bill, label: "Again" });
    expect(same.status).toBe(409);

    const list = await json(await call(billsRoute.GET, { path, params: { siteId }, cookie: owner.cookie }));
    const [row] = list.bills as { id: string; check: { heating: { kwh: number; total: number }; rest: { kwh: number; amount: number }; notes: string[] } }[];
    expect(row!.id).toBe(billId);
    // Heating: 1.68 + 0.525 on Monday (flat), 1.89 + 0.42 on Tuesday (time of use).
    const heatingTotal = 1.68 + 0.5 * 1.05 + 1.89 + 0.4 * 1.05;
    expect(row!.check.heating.kwh).toBeCloseTo(16, 9);
    expect(row!.check.heating.total).toBeCloseTo(heatingTotal, 9);
    expect(row!.check.rest.kwh).toBeCloseTo(14, 9);
    expect(row!.check.rest.amount).toBeCloseTo(9.5 - heatingTotal, 9);
    expect(row!.check.notes).toEqual([]);

    const lower = await put(billRoute.PUT, { siteId, billId }, { ...bill, billedKwh: 10 });
    expect(lower.status).toBe(200);
    const after = await json(await call(billsRoute.GET, { path, params: { siteId }, cookie: owner.cookie }));
    const [changed] = after.bills as { check: { rest: { kwh: number }; notes: string[] } }[];
    expect(changed!.check.rest.kwh).toBeCloseTo(-6, 9);
    expect(changed!.check.notes[0]).toContain("Heating alone comes to 6.0 kWh more than the bill");

    const removed = await call(billRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, billId }, cookie: owner.cookie });
    expect(removed.status).toBe(204);
    const actions = await getDb().select({ action: auditLog.action }).from(auditLog).where(and(eq(auditLog.siteId, siteId), eq(auditLog.entityId, billId))).orderBy(auditLog.id);
    expect(actions.map((a) => a.action)).toEqual(["bill.create", "bill.update", "bill.delete"]);
  });

  it("lists the demo's bills without figures to everyone who reads reports; only the owner changes them", async () => {
    const viewer = DEMO_MEMBERS.find((m) => m.role === "viewer")!;
    const grower = DEMO_MEMBERS.find((m) => m.role === "grower")!;
    const viewerCookie = await signIn(viewer.email, viewer.password);
    const path = `/api/sites/${DEMO_SITE.id}/bills`;
    const list = await json(await call(billsRoute.GET, { path, params: { siteId: DEMO_SITE.id }, cookie: viewerCookie }));
    const autumn = (list.bills as { id: string; billedKwh: number | null; check: { rest: unknown } }[]).find((b) => b.id === demoId("bill:2026-q3"));
    expect(autumn).toMatchObject({ billedKwh: null, check: { rest: null } });
    const tariffList = await call(tariffsRoute.GET, { path: "/x", params: { siteId: DEMO_SITE.id }, cookie: viewerCookie });
    expect(((await json(tariffList)).tariffs as { name: string }[]).map((t) => t.name)).toContain("Two-rate economy");
    const growerCookie = await signIn(grower.email, grower.password);
    const refused = await post(uploadRoute.POST, "/x", { siteId: DEMO_SITE.id }, { csv: "from,to,kwh,amount\n2026-09-01,2026-11-30,1,1\n" }, growerCookie);
    expect(refused.status).toBe(403);
    // Another site's tariff is not reached through one's own.
    const elsewhere = await call(tariffRoute.GET, { path: "/x", params: { siteId, tariffId: demoId("tariff:two-rate") }, cookie: owner.cookie });
    expect(elsewhere.status).toBe(404);
    const elsewhereBill = await call(billRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, billId: demoId("bill:2026-q3") }, cookie: owner.cookie });
    expect(elsewhereBill.status).toBe(404);
  });
});

describe("bills uploaded as CSV", () => {
  const upload = (csv: string) => post(uploadRoute.POST, `/api/sites/${siteId}/bills/upload`, { siteId }, { csv });
  const stored = () => getDb().select().from(billPeriods).where(eq(billPeriods.siteId, siteId)).orderBy(billPeriods.startsOn);
  const audits = async () => (await getDb().select().from(auditLog).where(and(eq(auditLog.siteId, siteId), eq(auditLog.entityType, "bill")))).length;
  const good = "\uFEFFfrom,to,kwh,amount,label\r\n2024-09-01,2024-11-30,1840.5,612.40,Autumn 2024\r\n2024-12-01,2025-02-28,2100,705.10,Winter\r\n";

  it("saves a good file with a BOM and CRLF, and the same file again changes nothing", async () => {
    const first = await upload(good);
    expect(first.status).toBe(200);
    expect(await json(first)).toMatchObject({ created: 2, updated: 0, unchanged: 0 });
    const rows = await stored();
    expect(rows.map((r) => [r.startsOn, r.endsOn, r.billedKwh, r.billedAmount, r.label])).toEqual([
      ["2024-09-01", "2024-11-30", 1840.5, 612.4, "Autumn 2024"],
      ["2024-12-01", "2025-02-28", 2100, 705.1, "Winter"],
    ]);
    const auditCount = await audits();
    const again = await upload(good);
    expect(await json(again)).toMatchObject({ created: 0, updated: 0, unchanged: 2 });
    expect(await stored()).toEqual(rows);
    expect(await audits()).toBe(auditCount);

    const corrected = await upload("from,to,kwh,amount\n2024-12-01,2025-02-28,2110,708.00\n");
    expect(await json(corrected)).toMatchObject({ created: 0, updated: 1, unchanged: 0 });
    const [, winter] = await stored();
    expect([winter!.id, winter!.billedKwh, winter!.label]).toEqual([rows[1]!.id, 2110, null]);
  });

  it("reports bad rows with their line numbers and saves none of the file", async () => {
    const before = await stored();
    const response = await upload("from,to,kwh,amount\n2023-09-01,2023-11-30,100,40\n2023-12-01,2023-11-30,100,40\nnot,a,bill,row\n");
    expect(response.status).toBe(400);
    const body = (await response.json()) as { error: { message: string }; rows: { line: number; message: string }[] };
    expect(body.error.message).toBe("2 lines need fixing; nothing was saved.");
    expect(body.rows.map((r) => r.line)).toEqual([3, 4]);
    expect(body.rows[1]!.message).toContain("from: must be a date, YYYY-MM-DD");
    expect(await stored()).toEqual(before);
  });

  it("refuses a file that is too large or not CSV, saying so", async () => {
    const before = await stored();
    const big = await upload(`from,to,kwh,amount\n${"2023-09-01,2023-11-30,100,40\n".repeat(1200)}`);
    expect(big.status).toBe(400);
    expect((await json(big)).error!.message).toBe("csv: The file is too large: a bill file may be at most 32 kB (400 bills)");
    const huge = await upload("x".repeat(70_000));
    expect(huge.status).toBe(413);
    const picture = await upload("\u0089PNG\r\n\u001a\n\u0000\u0000\u0000\rIHDR");
    expect(picture.status).toBe(400);
    expect((await json(picture)).error!.message).toBe("This is not a CSV text file. Save the bills from your spreadsheet as CSV and try again.");
    const noJson = await post(uploadRoute.POST, "/x", { siteId }, "from,to,kwh,amount");
    expect(noJson.status).toBe(400);
    expect(await stored()).toEqual(before);
  });
});
