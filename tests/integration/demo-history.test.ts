// The demo history: the real decision code run against the simulated houses, written
// as switches, per-minute readings and (for the last days) raw readings.
import { beforeAll, describe, expect, it } from "vitest";
import { and, asc, between, count, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { DEMO_SITE, seedDemo } from "@/db/seed";
import { alerts, plugs, readingMinutes, readings, sensors, switchEvents } from "@/db/schema";
import { writeDemoHistory } from "@/fakes/demo-history";
import { alertDetailFrom } from "@/lib/alerts/detail";
import { DEFAULT_ALERT_RULES } from "@/lib/alerts/rules";

const endMs = Date.parse("2026-11-20T12:00:00Z");
let plugIds: string[];
let sensorIds: string[];

beforeAll(async () => {
  const db = getDb();
  await seedDemo(db);
  plugIds = (await db.select({ id: plugs.id }).from(plugs).where(eq(plugs.siteId, DEMO_SITE.id))).map((p) => p.id);
  sensorIds = (await db.select({ id: sensors.id }).from(sensors).where(eq(sensors.siteId, DEMO_SITE.id))).map((s) => s.id);
});

describe("the demo history", () => {
  it("writes switches that follow on from each other, and readings for every sensor", async () => {
    const db = getDb();
    const summary = await writeDemoHistory({ db, site: DEMO_SITE.slug, days: 2, endMs });
    expect(summary.skipped).toBe(false);
    expect(summary.switches).toBeGreaterThan(0);

    const events = await db.select().from(switchEvents).where(inArray(switchEvents.plugId, plugIds)).orderBy(asc(switchEvents.at));
    expect(events).toHaveLength(summary.switches);
    const byPlug = new Map<string, typeof events>();
    for (const e of events) byPlug.set(e.plugId, [...(byPlug.get(e.plugId) ?? []), e]);
    for (const list of byPlug.values()) {
      for (let i = 1; i < list.length; i++) {
        // Each switch starts from where the previous one left the plug.
        expect(list[i]!.fromOn).toBe(list[i - 1]!.toOn);
        expect(list[i]!.toOn).not.toBe(list[i]!.fromOn);
      }
    }
    for (const e of events) {
      expect(e.at.getTime()).toBeGreaterThanOrEqual(endMs - 2 * 86_400_000);
      expect(e.at.getTime()).toBeLessThanOrEqual(endMs);
      expect(["schedule", "default", "safety", "failsafe"]).toContain(e.cause);
    }

    // Two days of minutes for each sensor (the raw rows cover them too: under the raw-keeping span).
    for (const sensorId of sensorIds) {
      const [minutes] = await db.select({ n: count() }).from(readingMinutes).where(eq(readingMinutes.sensorId, sensorId));
      const [raw] = await db.select({ n: count() }).from(readings).where(eq(readings.sensorId, sensorId));
      expect(minutes!.n).toBeGreaterThanOrEqual(2 * 24 * 60 - 1);
      expect(raw!.n).toBeGreaterThan(0);
    }
    expect(summary.minutes).toBeGreaterThan(0);

    // The houses' alert rules ran over the same readings: each alert it wrote opened on a
    // reading of the history that was past its limit, and closed (if it did) later.
    const written = await db
      .select()
      .from(alerts)
      .where(and(inArray(alerts.sensorId, sensorIds), between(alerts.raisedAt, new Date(endMs - 2 * 86_400_000), new Date(endMs))));
    expect(written).toHaveLength(summary.alerts!);
    for (const a of written) {
      expect(["too_cold", "too_warm", "condensation"]).toContain(a.kind);
      const detail = alertDetailFrom(a.detail);
      const [minute] = await db.select().from(readingMinutes).where(and(eq(readingMinutes.sensorId, a.sensorId!), eq(readingMinutes.minute, a.raisedAt)));
      expect(minute!.tempMeanC).toBeCloseTo(detail.valueC!, 2);
      if (a.kind === "too_cold") expect(detail.valueC!).toBeLessThanOrEqual(detail.limitC!);
      if (a.kind === "too_warm") expect(detail.valueC!).toBeGreaterThanOrEqual(detail.limitC!);
      if (a.kind === "condensation") {
        const near = detail.valueC! - detail.dewPointC! <= DEFAULT_ALERT_RULES.condensation.dewMarginK + 1e-9;
        const humid = (detail.rh ?? 0) >= DEFAULT_ALERT_RULES.condensation.humidAboveRh;
        expect(near || humid).toBe(true);
      }
      if (a.clearedAt) expect(a.clearedAt.getTime()).toBeGreaterThan(a.raisedAt.getTime());
    }
  });

  it("is not written twice", async () => {
    const db = getDb();
    const [before] = await db.select({ n: count() }).from(switchEvents).where(inArray(switchEvents.plugId, plugIds));
    const again = await writeDemoHistory({ db, site: DEMO_SITE.slug, days: 2, endMs });
    expect(again.skipped).toBe(true);
    const [after] = await db.select({ n: count() }).from(switchEvents).where(inArray(switchEvents.plugId, plugIds));
    expect(after!.n).toBe(before!.n);
  });
});
