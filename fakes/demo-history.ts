// The demo's past: the real schedule and decision code run against the thermal model
// of each demo house over the last N simulated days, minute by minute, so that the
// demo starts with readings and switches that follow from its own settings. The
// houses' alert rules run over the same readings, so the alerts page starts with the
// alerts those days would have raised (already past: nobody is e-mailed about them).
//
//   tsx fakes/demo-history.ts [days]     (DATABASE_URL; skipped when history exists)
import path from "node:path";
import { fileURLToPath } from "node:url";
import { createHash } from "node:crypto";
import { count, inArray } from "drizzle-orm";
import { connect, type Database } from "../db/client";
import { alerts, meterSamples, plugStates, readingMinutes, readings, switchEvents } from "../db/schema";
import { evaluateReading, SENSOR_CLOSED, type SensorAlertContext, type SensorConditions } from "../lib/alerts/evaluate";
import { rebuildEnergyDays } from "../db/energy-days";
import { insertMany } from "../db/bulk";
import { loadConfig, rulesOf } from "../controller/config";
import { compilePlugSchedule } from "../controller/plug-schedule";
import { decide } from "../lib/control";
import { createSiteModel, houseParams } from "./house-model";
import { loadSiteLayout } from "./layout";

const MINUTE = 60_000;
/** Raw readings older than this are kept only as per-minute rows (as the controller does). */
const RAW_DAYS = 7;

export type DemoHistoryOptions = { db: Database; site: string; days: number; endMs: number; seed?: number };
export type DemoHistorySummary = { skipped: boolean; switches: number; minutes: number; raw: number; samples: number; alerts?: number };


/** A stable command id for a historical switch, so a rerun cannot duplicate it. */
function historyId(plugId: string, atMs: number) {
  return `history-${createHash("sha1").update(`${plugId}:${atMs}`).digest("hex").slice(0, 32)}`;
}

export async function writeDemoHistory(options: DemoHistoryOptions): Promise<DemoHistorySummary> {
  const { db } = options;
  const layout = await loadSiteLayout(db, options.site);
  const plugIds = layout.plugs.map((p) => p.id);
  if (plugIds.length === 0) return { skipped: true, switches: 0, minutes: 0, raw: 0, samples: 0 };
  const [existing] = await db.select({ n: count() }).from(switchEvents).where(inArray(switchEvents.plugId, plugIds));
  if ((existing?.n ?? 0) > 0) return { skipped: true, switches: 0, minutes: 0, raw: 0, samples: 0 };

  const config = await loadConfig(db, new Date(options.endMs), [options.site]);
  const site = config.sites[0]!;
  const endMs = Math.floor(options.endMs / MINUTE) * MINUTE;
  const startMs = endMs - options.days * 24 * 3600_000;
  const rawFromMs = endMs - RAW_DAYS * 24 * 3600_000;

  const runtimes = config.plugs.map((plug) => ({
    plug,
    rules: rulesOf(plug, site),
    schedule: compilePlugSchedule(
      config.schedules.filter((s) => s.plugId === plug.id),
      site.timeZone,
    ),
    on: false,
    sinceMs: startMs - 3600_000,
    switchId: null as string | null,
    cause: null as ReturnType<typeof decide>["cause"] | null,
    /** A metering plug's counter, in watt-hours (a little under the rated watts, as real heaters draw). */
    meterWh: 0,
  }));
  const sensorOfHouse = new Map(layout.sensors.filter((s) => s.placement === "inside").map((s) => [s.houseId, s.id]));
  // Each inside sensor as the controller's alert rules see it, with its conditions.
  const watched = new Map<string, { context: SensorAlertContext; conditions: SensorConditions }>();
  for (const sensor of config.sensors) {
    const house = config.houses.find((h) => h.id === sensor.houseId);
    if (!house || sensor.placement !== "inside" || sensorOfHouse.get(house.id) !== sensor.id) continue;
    const context = { id: sensor.id, name: sensor.name, outside: false, house: { id: house.id, name: house.name, lowLimitC: house.lowLimitC, rules: house.alertRules } };
    watched.set(sensor.id, { context, conditions: SENSOR_CLOSED });
  }
  const alertRows: (typeof alerts.$inferInsert)[] = [];
  const openAlert = new Map<string, typeof alerts.$inferInsert>();
  const outsideSensors = layout.sensors.filter((s) => s.placement === "outside");
  const model = createSiteModel({
    timeZone: site.timeZone,
    startMs,
    stepMs: MINUTE,
    seed: options.seed ?? 7,
    houses: layout.houses.map((h) => ({ id: h.id, params: houseParams(h.shape) })),
    heatW: (houseId) =>
      runtimes.reduce((sum, r) => (r.plug.houseId === houseId && r.on ? sum + r.plug.applianceWatts : sum), 0),
  });

  const switches: (typeof switchEvents.$inferInsert)[] = [];
  const minutes: (typeof readingMinutes.$inferInsert)[] = [];
  const raw: (typeof readings.$inferInsert)[] = [];
  const samples: (typeof meterSamples.$inferInsert)[] = [];
  const written = { switches: 0, minutes: 0, raw: 0, samples: 0 };

  async function flush(final = false) {
    const limit = final ? 1 : 2000;
    await db.transaction(async (tx) => {
      while (switches.length >= limit || (final && switches.length)) {
        const batch = switches.splice(0, 1000);
        await insertMany(tx, switchEvents, batch, { keep: true });
        written.switches += batch.length;
      }
      while (minutes.length >= limit || (final && minutes.length)) {
        const batch = minutes.splice(0, 1000);
        await insertMany(tx, readingMinutes, batch, { keep: true });
        written.minutes += batch.length;
      }
      while (raw.length >= limit || (final && raw.length)) {
        const batch = raw.splice(0, 1000);
        await insertMany(tx, readings, batch);
        written.raw += batch.length;
      }
      while (samples.length >= limit || (final && samples.length)) {
        const batch = samples.splice(0, 1000);
        await insertMany(tx, meterSamples, batch, { keep: true });
        written.samples += batch.length;
      }
    });
  }

  for (let t = startMs; t < endMs; t += MINUTE) {
    model.advanceTo(t);
    const tempBySensor = new Map<string, number>();
    for (const house of layout.houses) {
      const sensorId = sensorOfHouse.get(house.id);
      if (!sensorId) continue;
      const snap = model.snapshot(house.id);
      const tempC = Math.round(snap.airC * 100) / 100;
      const rh = Math.round(snap.rh * 100) / 100;
      tempBySensor.set(sensorId, tempC);
      const watch = watched.get(sensorId);
      if (watch) {
        const result = evaluateReading(watch.conditions, watch.context, { tempC, rh, batteryPercent: 90 }, t);
        watch.conditions = result.conditions;
        for (const change of result.changes) {
          const key = `${change.kind}:${sensorId}`;
          if (change.change === "raise") {
            const row = { siteId: site.id, houseId: house.id, sensorId, kind: change.kind, message: change.message, detail: change.detail, raisedAt: new Date(t) };
            alertRows.push(row);
            openAlert.set(key, row);
          } else {
            const row = openAlert.get(key);
            if (!row) continue;
            openAlert.delete(key);
            row.clearedAt = new Date(t);
            row.clearedMessage = change.message;
            row.detail = { ...(row.detail as object), cleared: change.cleared };
          }
        }
      }
      const at = new Date(t);
      minutes.push({ sensorId, minute: at, samples: 1, tempMinC: tempC, tempMaxC: tempC, tempMeanC: tempC, rhMean: rh });
      if (t >= rawFromMs) raw.push({ sensorId, at, tempC, rh, battery: 0.9 });
    }
    for (const sensor of outsideSensors) {
      const { weather } = model.snapshot(sensor.houseId);
      const tempC = Math.round(weather.outsideC * 100) / 100;
      const rh = Math.round(weather.outsideRh * 100) / 100;
      const at = new Date(t);
      minutes.push({ sensorId: sensor.id, minute: at, samples: 1, tempMinC: tempC, tempMaxC: tempC, tempMeanC: tempC, rhMean: rh });
      if (t >= rawFromMs) raw.push({ sensorId: sensor.id, at, tempC, rh, battery: 0.9 });
    }
    for (const r of runtimes) {
      if (r.plug.metersEnergy) {
        if (r.on) r.meterWh += (r.plug.applianceWatts * 0.96) / 60;
        // The plug reports every minute; the controller keeps a sample every 15 minutes.
        if ((t - startMs) % (15 * MINUTE) === 0) samples.push({ plugId: r.plug.id, at: new Date(t), wattHours: Math.round(r.meterWh) });
      }
      const tempC = r.plug.sensorId ? (tempBySensor.get(r.plug.sensorId) ?? null) : null;
      const decision = decide({
        rules: r.rules,
        nowMs: t,
        reading: tempC === null ? null : { tempC, atMs: t },
        current: { on: r.on, sinceMs: r.sinceMs },
        override: null,
        window: r.schedule.activeAt(t),
      });
      r.cause = decision.cause;
      if (decision.on === r.on) continue;
      // Plugs answer on a quiet loopback network in a fraction of a second.
      const latencyMs = 120 + ((t / MINUTE) % 7) * 35;
      switches.push({
        plugId: r.plug.id,
        at: new Date(t),
        fromOn: r.on,
        toOn: decision.on,
        cause: decision.cause,
        ratedWatts: r.plug.applianceWatts,
        readingTempC: decision.readingTempC,
        readingAt: decision.readingTempC === null ? null : new Date(t),
        commandId: historyId(r.plug.id, t),
        ackAt: new Date(t + latencyMs),
        latencyMs,
      });
      r.on = decision.on;
      r.sinceMs = t + latencyMs;
      r.switchId = historyId(r.plug.id, t);
    }
    if (minutes.length >= 6000) await flush();
  }
  await flush(true);
  // Alerts still open where the history ends stay open: the controller takes them over.
  await insertMany(db, alerts, alertRows);
  // Each plug's present state where the history leaves it, as the controller would
  // have stored it: a controller starting now carries on from there.
  const updatedAt = new Date(endMs);
  await insertMany(
    db,
    plugStates,
    runtimes.map((r) => ({
      plugId: r.plug.id,
      on: r.switchId ? r.on : null,
      since: r.switchId ? new Date(r.sinceMs) : null,
      switchCommandId: r.switchId,
      presentCause: r.cause,
      lastSeenAt: updatedAt,
      updatedAt,
    })),
    { fillIn: ["on", "since", "switchCommandId", "presentCause", "lastSeenAt", "updatedAt"] },
  );
  // The energy roll-up is kept by the controller as it logs switches; the past written
  // here is rolled up once, so the reports have its kWh.
  await rebuildEnergyDays(db, { siteIds: [site.id] });
  return { skipped: false, ...written, alerts: alertRows.length };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error("DATABASE_URL is not set.");
    process.exit(2);
  }
  const days = Number(process.argv[2] ?? 60);
  const { db, pool } = connect(url, { timeoutMs: Infinity });
  try {
    const began = Date.now();
    const summary = await writeDemoHistory({ db, site: process.env.CLOCHE_FAKES_SITE ?? "fernhollow", days, endMs: Date.now() });
    console.log(summary.skipped ? "demo history present; nothing to do." : `demo history written in ${Date.now() - began} ms: ${JSON.stringify(summary)}`);
  } finally {
    await pool.end();
  }
}
