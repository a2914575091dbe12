// `npm run bench:controller`: figures for the controller's hot paths (not a test).
//   1. decision cost per tick for 10,000 plugs (schedule lookup + decide), median of 200 ticks,
//      beside a plain loop that works out each site's local time once per tick (the floor)
//   2. switch-log writes sustained into MariaDB (its own private instance)
//   3. reading → command → echo latency, and a schedule edge's fan-out, through the broker
//      with 1,000 simulated plugs, each against the broker's own figure (tests/bench/mqtt.ts)
import { randomUUID } from "node:crypto";
import pino from "pino";
import { DateTime } from "luxon";
import { TEST_DATABASE_FOLDER, startLocalDatabase } from "../../scripts/local-server";
import { migrateDatabase } from "../../db/migrate";
import { connect } from "../../db/client";
import { houses, plugs, sites } from "../../db/schema";
import { createSwitchLog } from "../../controller/switch-log";
import { mqttBench } from "./mqtt";
import { compilePlugSchedule } from "../../controller/plug-schedule";
import { decide, sharedRules, type PlugRules } from "../../lib/control";
import type { Schedule } from "../../lib/schedule";

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

function decisionBench() {
  const zones = ["Europe/London", "Australia/Sydney", "America/New_York", "Pacific/Auckland", "Europe/Berlin"];
  const now = Date.now();
  const plugsInTick = Array.from({ length: 10_000 }, (_, i) => {
    const schedule: Schedule = {
      id: `s${i}`,
      validFrom: null,
      validUntil: null,
      skipDays: [],
      windows: [
        { id: `w${i}a`, recurrence: "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR", startsAt: `0${6 + (i % 3)}:00:00`, durationMin: 14 * 60, mode: "band", lowC: 8, highC: 10 },
        { id: `w${i}b`, recurrence: "FREQ=WEEKLY;BYDAY=SA,SU", startsAt: "08:00:00", durationMin: 10 * 60, mode: i % 5 === 0 ? "on" : "band", lowC: 6, highC: 8 },
      ],
    };
    const rules: PlugRules = {
      applianceKind: i % 5 === 0 ? "light" : "heater",
      applianceWatts: 2000,
      ratedCurrentA: 13,
      mainsVoltage: 230,
      continuousLoadPercent: 80,
      highLimitC: 32,
      failsafe: "duty",
      failsafeDutyPercent: 30,
      failsafeDutyPeriodS: 1200,
      staleAfterS: 600,
      outsideWindows: "frost",
      frostLowC: 3,
      frostHighC: 5,
      minOnS: 180,
      minOffS: 180,
    };
    return { rules: sharedRules(rules), schedule: compilePlugSchedule([schedule], zones[i % zones.length]!), tempC: 2 + (i % 12), on: i % 2 === 0 };
  });
  const compileStart = performance.now();
  for (const p of plugsInTick) p.schedule.activeAt(now);
  const compileMs = performance.now() - compileStart;
  const ticks: number[] = [];
  for (let t = 0; t < 200; t++) {
    const nowMs = now + t * 1000;
    const started = performance.now();
    for (const p of plugsInTick) {
      decide({
        rules: p.rules,
        nowMs,
        reading: { tempC: p.tempC, atMs: nowMs - 5000 },
        current: { on: p.on, sinceMs: nowMs - 600_000 },
        override: null,
        window: p.schedule.activeAt(nowMs),
      });
    }
    ticks.push(performance.now() - started);
  }
  // The floor: one luxon DateTime per zone per tick, then a bare band test per plug.
  const floor: number[] = [];
  let on = 0;
  for (let t = 0; t < 200; t++) {
    const nowMs = now + t * 1000;
    const started = performance.now();
    const minuteOfDay = zones.map((zone) => {
      const local = DateTime.fromMillis(nowMs, { zone });
      return local.hour * 60 + local.minute;
    });
    for (let i = 0; i < plugsInTick.length; i++) {
      const p = plugsInTick[i]!;
      const m = minuteOfDay[i % zones.length]!;
      if (m >= 360 && m < 1200 ? p.tempC <= 8 || (p.on && p.tempC < 10) : p.tempC <= 3) on++;
    }
    floor.push(performance.now() - started);
  }
  if (on < 0) console.log(on);
  console.log(`decision tick, 10,000 plugs: median ${median(ticks).toFixed(2)} ms, max ${Math.max(...ticks).toFixed(2)} ms (target < 2 ms); compiling all schedules once: ${compileMs.toFixed(0)} ms; plain-loop floor: median ${median(floor).toFixed(2)} ms`);
}

async function switchLogBench(databaseUrl: string) {
  const { db, pool } = connect(databaseUrl);
  const siteId = randomUUID();
  const houseId = randomUUID();
  await db.insert(sites).values({ id: siteId, slug: "bench", name: "Bench", timeZone: "UTC", currency: "GBP" });
  await db.insert(houses).values({ id: houseId, siteId, name: "Bench", kind: "other", lengthM: 1, widthM: 1, eaveHeightM: 1, ridgeHeightM: 1, glazing: "single_glass" });
  const plugIds = Array.from({ length: 100 }, () => randomUUID());
  await db.insert(plugs).values(
    plugIds.map((id, i) => ({ id, siteId, houseId, deviceId: `p${i}`, name: `Plug ${i}`, applianceKind: "heater" as const, applianceWatts: 1000, ratedCurrentA: 13 })),
  );
  const log = createSwitchLog({ db, logger: pino({ level: "silent" }), flushMs: 50, maxBatch: 1000 });
  const total = 100_000;
  const started = performance.now();
  const base = Date.now();
  for (let i = 0; i < total; i++) {
    const commandId = randomUUID();
    log.record({ plugId: plugIds[i % 100]!, at: new Date(base + i), fromOn: i % 2 === 1, toOn: i % 2 === 0, cause: "schedule", commandId });
    if (i % 1000 === 999) await log.flush();
  }
  await log.flush();
  const seconds = (performance.now() - started) / 1000;
  console.log(`switch log: ${total} events in ${seconds.toFixed(2)} s = ${Math.round(total / seconds)} events/s (target ≥ 10,000)`);
  await log.close();
  await pool.end();
}

decisionBench();
const database = await startLocalDatabase({ folder: TEST_DATABASE_FOLDER, port: 0, database: "cloche_bench", fresh: true, log: () => {} });
try {
  await migrateDatabase(database.url);
  await switchLogBench(database.url);
  await mqttBench(database.url);
} finally {
  await database.stop();
}
