// The daily summary through the real MariaDB and the test run's SMTP sink: its figures
// are the reports' own for that day, its extremes are the readings put in, it covers
// the right stretch of the site's day, and it goes once a day.
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshEnergyDays } from "@/db/energy-days";
import { getEnergyReport } from "@/db/queries/energy";
import { getNotifierSites } from "@/db/queries/alert-outbox";
import { dailySummaries, plugs, readingMinutes, sensors, switchEvents, tariffRates, tariffs } from "@/db/schema";
import { summaryWindowAt } from "@/lib/alerts/summary";
import { dailySummaryContent } from "@/lib/server/alerts/daily-summary";
import { createNotifier } from "@/lib/server/alerts/notifier";
import { listMail, readMail } from "@/lib/server/mailbox";
import { clearAlert, createAlertSite, insertAlert, outboxOf, quietNotifierLogger } from "../support/alert-site";

const mailFolder = process.env.CLOCHE_MAIL_SINK_DIR!;
const at = (iso: string) => new Date(iso);

async function inbox(address: string) {
  const mine = (await listMail(mailFolder, { limit: 10_000 })).filter((m) => m.to.includes(address)).reverse();
  return Promise.all(mine.map(async (m) => (await readMail(mailFolder, m.id))!));
}

/** A site whose house had its heater on 02:00–06:30 on 13 January 2031 (London, GMT), with readings and alerts that day. */
async function summarySite(summaryTime: string) {
  const site = await createAlertSite({
    summaryTime,
    members: [
      { name: "Olive", role: "owner" },
      { name: "Gil", role: "grower", unit: "f", dailySummary: true },
      { name: "Hal", role: "helper" },
    ],
  });
  const db = getDb();
  const heaterId = randomUUID();
  await db.insert(plugs).values({ id: heaterId, siteId: site.siteId, houseId: site.houseId, deviceId: "heater-1", name: "Heater", applianceKind: "heater", applianceWatts: 2000, ratedCurrentA: 13 });
  const tariffId = randomUUID();
  await db.insert(tariffs).values({ id: tariffId, siteId: site.siteId, name: "Flat", kind: "flat", standingChargePerDay: 0.5, taxPercent: 5, validFrom: "2030-01-01" });
  await db.insert(tariffRates).values({ id: `flat-${tariffId.slice(0, 8)}`, tariffId, label: "Any time", startsAt: "00:00:00", endsAt: "00:00:00", pricePerKwh: 0.25 });
  for (const [iso, toOn] of [["2031-01-13T02:00:00Z", true], ["2031-01-13T06:30:00Z", false], ["2031-01-14T09:00:00Z", true], ["2031-01-14T10:00:00Z", false]] as const) {
    const when = at(iso);
    await db.insert(switchEvents).values({ plugId: heaterId, at: when, fromOn: !toOn, toOn, cause: "schedule", ratedWatts: toOn ? 2000 : null, commandId: randomUUID(), ackAt: when, latencyMs: 0 });
    await refreshEnergyDays(db, [{ plugId: heaterId, fromMs: when.getTime(), toMs: when.getTime() }]);
  }
  const inside = randomUUID();
  const outside = randomUUID();
  await db.insert(sensors).values([
    { id: inside, siteId: site.siteId, houseId: site.houseId, deviceId: "air-1", name: "Bench", placement: "inside" },
    { id: outside, siteId: site.siteId, houseId: site.houseId, deviceId: "out-1", name: "Outside", placement: "outside" },
  ]);
  const minute = (sensorId: string, iso: string, min: number, max: number) => ({ sensorId, minute: at(iso), samples: 2, tempMinC: min, tempMaxC: max, tempMeanC: (min + max) / 2, rhMean: 80 });
  await db.insert(readingMinutes).values([
    minute(inside, "2031-01-13T00:00:00Z", 6, 6.5),
    minute(inside, "2031-01-13T03:12:00Z", 1.4, 2),
    minute(inside, "2031-01-13T05:00:00Z", 1.4, 1.8),
    minute(inside, "2031-01-13T14:40:00Z", 20, 24.6),
    minute(inside, "2031-01-13T23:59:00Z", 7, 7.5),
    // Outside the day, and an outside sensor: neither counts.
    minute(inside, "2031-01-12T23:59:00Z", -3, 30),
    minute(inside, "2031-01-14T00:00:00Z", -4, 31),
    minute(outside, "2031-01-13T04:00:00Z", -8, -7),
  ]);
  const frost = await insertAlert(site, { kind: "too_cold", raisedAt: at("2031-01-13T03:10:00Z"), message: "Long house is below its frost limit." });
  await clearAlert(frost, at("2031-01-13T04:00:00Z"));
  const old = await insertAlert(site, { kind: "too_warm", raisedAt: at("2031-01-12T13:00:00Z"), message: "Long house was too warm." });
  await clearAlert(old, at("2031-01-12T14:00:00Z"));
  return site;
}

describe("the daily summary", () => {
  it("a morning time sends yesterday's figures, equal to the report's for that day, once, to those who have it on", async () => {
    const site = await summarySite("07:00");
    const [olive, gil, hal] = site.members;
    const clock = { now: at("2031-01-14T06:59:00Z") };
    const n = await createNotifier({ logger: quietNotifierLogger, siteIds: [site.siteId], now: () => clock.now, loop: false, controllerSilentAfterMs: 365 * 24 * 3600_000, baseUrl: "http://127.0.0.1:3000" });
    try {
      expect((await n.runOnce())!.summaries).toBe(0);
      clock.now = at("2031-01-14T07:00:00Z");
      expect((await n.runOnce())!).toMatchObject({ summaries: 1, written: 2 });
      clock.now = at("2031-01-14T07:30:00Z");
      expect((await n.runOnce())!.summaries).toBe(0);
      clock.now = at("2031-01-14T23:59:00Z");
      expect((await n.runOnce())!.summaries).toBe(0);

      // The figures are the report's own for 13 January…
      const [notifierSite] = await getNotifierSites({ siteIds: [site.siteId] });
      const window = summaryWindowAt(at("2031-01-14T07:00:00Z"), "Europe/London", "07:00")!;
      const content = await dailySummaryContent(notifierSite!, window);
      const report = await getEnergyReport({ siteId: site.siteId, fromDay: "2031-01-13", toDay: "2031-01-13", bucket: "day", now: at("2031-02-01T00:00:00Z") });
      const house = report.houses.find((h) => h.id === site.houseId)!;
      expect(content.houses[0]).toMatchObject({ name: "Long house", onHours: house.onHours, kwh: house.costedKwh, cost: house.cost });
      expect(content.totals).toEqual({ onHours: report.site.onHours, kwh: report.site.costedKwh, cost: report.site.cost, standingCharge: report.site.standingCharge, total: report.site.total });
      // …which are 4.5 h of a 2 kW heater: 9 kWh at 0.25 + 5 % tax = 2.3625; standing 0.50 + 5 %.
      expect(house.onHours).toBeCloseTo(4.5, 9);
      expect(house.costedKwh).toBeCloseTo(9, 9);
      expect(house.cost).toBeCloseTo(2.3625, 9);
      // …and the extremes are the inside readings of that day, the earliest minute on a tie.
      expect(content.houses[0]!.min).toEqual({ c: 1.4, at: at("2031-01-13T03:12:00Z") });
      expect(content.houses[0]!.max).toEqual({ c: 24.6, at: at("2031-01-13T14:40:00Z") });
      expect(content.houses[0]!.alerts.map((a) => a.kind)).toEqual(["too_cold"]);

      const [oliveMail] = await inbox(olive!.email);
      expect(oliveMail!.subject).toBe(`Daily summary for ${site.name} — Mon 13 Jan`);
      expect(oliveMail!.text).toContain("This covers the whole of Mon 13 Jan, midnight to midnight (Europe/London).");
      expect(oliveMail!.text).toContain("Coldest 1.4 °C at 03:12; warmest 24.6 °C at 14:40.");
      expect(oliveMail!.text).toContain("ran 4.5 h, using 9 kWh (£2.36)");
      expect(oliveMail!.text).toContain("Frost risk: Long house is below its frost limit. (from 03:10, back to normal at 04:00)");
      expect(oliveMail!.text).not.toContain("too warm");
      expect(oliveMail!.text).toContain("With the day's standing charge (£0.53): £2.89.");
      const gilMail = await inbox(gil!.email);
      expect(gilMail).toHaveLength(1);
      expect(gilMail[0]!.text).toContain("Coldest 34.5 °F at 03:12; warmest 76.3 °F at 14:40.");
      expect(await inbox(hal!.email)).toEqual([]);

      const rows = await outboxOf(site.siteId);
      expect(rows.map((r) => [r.purpose, r.summaryDay, r.status])).toEqual([
        ["daily_summary", "2031-01-13", "sent"],
        ["daily_summary", "2031-01-13", "sent"],
      ]);
      const recorded = await getDb().select().from(dailySummaries).where(eq(dailySummaries.siteId, site.siteId));
      expect(recorded).toEqual([{ siteId: site.siteId, day: "2031-01-13", composedAt: at("2031-01-14T07:00:00Z"), recipients: 2 }]);

      // The next morning, the next day's.
      clock.now = at("2031-01-15T07:05:00Z");
      expect((await n.runOnce())!.summaries).toBe(1);
      expect((await inbox(olive!.email)).map((m) => m.subject)).toEqual([`Daily summary for ${site.name} — Mon 13 Jan`, `Daily summary for ${site.name} — Tue 14 Jan`]);
      expect((await inbox(olive!.email))[1]!.text).toContain("ran 1.0 h, using 2 kWh");
    } finally {
      await n.close();
    }
  });

  it("an afternoon time sends today up to the summary time", async () => {
    const site = await summarySite("18:00");
    const [olive] = site.members;
    const clock = { now: at("2031-01-13T18:02:00Z") };
    const n = await createNotifier({ logger: quietNotifierLogger, siteIds: [site.siteId], now: () => clock.now, loop: false, controllerSilentAfterMs: 365 * 24 * 3600_000, baseUrl: "http://127.0.0.1:3000" });
    try {
      expect((await n.runOnce())!.summaries).toBe(1);
      const [mail] = await inbox(olive!.email);
      expect(mail!.subject).toBe(`Daily summary for ${site.name} — Mon 13 Jan until 18:00`);
      expect(mail!.text).toContain("from midnight up to 18:00");
      expect(mail!.text).toContain("Coldest 1.4 °C at 03:12; warmest 24.6 °C at 14:40.");
      const [recorded] = await getDb().select().from(dailySummaries).where(and(eq(dailySummaries.siteId, site.siteId), eq(dailySummaries.day, "2031-01-13")));
      expect(recorded!.recipients).toBe(2);
    } finally {
      await n.close();
    }
  });

  it("two notifiers at once write one summary", async () => {
    const site = await summarySite("07:00");
    const clock = { now: at("2031-01-14T07:00:00Z") };
    const options = { logger: quietNotifierLogger, siteIds: [site.siteId], now: () => clock.now, loop: false, controllerSilentAfterMs: 365 * 24 * 3600_000 };
    const [a, b] = await Promise.all([createNotifier(options), createNotifier(options)]);
    try {
      await Promise.all([a.runOnce(), b.runOnce(), a.runOnce(), b.runOnce()]);
      expect(await outboxOf(site.siteId)).toHaveLength(2);
      expect(await inbox(site.members[0]!.email)).toHaveLength(1);
    } finally {
      await Promise.all([a.close(), b.close()]);
    }
  });
});
