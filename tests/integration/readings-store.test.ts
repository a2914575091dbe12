// Readings in MariaDB: raw rows in batches, a per-minute summary, raw rows kept for a
// set time only, and each device's presence.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, count, eq } from "drizzle-orm";
import pino from "pino";
import { getDb } from "@/db/client";
import { readingMinutes, readings, sensorStates } from "@/db/schema";
import { createReadingsStore, type ReadingsStore } from "@/controller/readings-store";
import { createControlSite, type ControlSite } from "../support/control-site";

const HOUR = 3600_000;
// A fixed day in the past, away from other tests' rows (they use the real clock).
const t0 = Date.parse("2026-11-25T10:00:00Z");
let clock = t0;
let site: ControlSite;
let store: ReadingsStore;

const at = (minute: number, second: number) => new Date(t0 + minute * 60_000 + second * 1000);

async function minutesOf(sensorId = site.sensorId) {
  return getDb()
    .select()
    .from(readingMinutes)
    .where(eq(readingMinutes.sensorId, sensorId))
    .orderBy(asc(readingMinutes.minute));
}

beforeAll(async () => {
  site = await createControlSite(getDb());
  store = createReadingsStore({
    db: getDb(),
    logger: pino({ level: "silent" }),
    flushMs: 60_000,
    maxBatch: 2,
    maxWaiting: 1000,
    rawRetentionMs: HOUR,
    now: () => clock,
  });
});

afterAll(async () => {
  await store.close();
});

describe("the readings store", () => {
  it("summarises each complete minute: samples, lowest, highest, mean", async () => {
    const sensorId = site.sensorId;
    // Minute 0: 4, 5, 6 °C at 80, 82, 84 %RH; minute 1: one reading with no humidity;
    // minute 2: 7.25 °C. Minute 3 is still running when the roll-up comes.
    store.add({ sensorId, at: at(0, 5), tempC: 4, rh: 80, battery: 0.9 });
    store.add({ sensorId, at: at(0, 25), tempC: 5, rh: 82, battery: 0.9 });
    store.add({ sensorId, at: at(0, 45), tempC: 6, rh: 84, battery: 0.9 });
    store.add({ sensorId, at: at(1, 0), tempC: 3.5, rh: null, battery: 0.9 });
    store.add({ sensorId, at: at(2, 59.999), tempC: 7.25, rh: 70, battery: 0.9 });
    store.add({ sensorId, at: at(3, 1), tempC: 8, rh: 70, battery: 0.9 });
    await store.flush();
    const [raw] = await getDb().select({ n: count() }).from(readings).where(eq(readings.sensorId, sensorId));
    expect(raw!.n).toBe(6);

    clock = t0 + 3 * 60_000 + 10_000;
    await store.rollUp();
    const rows = await minutesOf();
    expect(rows.map((r) => ({ ...r, minute: r.minute.toISOString() }))).toEqual([
      { sensorId, minute: "2026-11-25T10:00:00.000Z", samples: 3, tempMinC: 4, tempMaxC: 6, tempMeanC: 5, rhMean: 82 },
      { sensorId, minute: "2026-11-25T10:01:00.000Z", samples: 1, tempMinC: 3.5, tempMaxC: 3.5, tempMeanC: 3.5, rhMean: null },
      { sensorId, minute: "2026-11-25T10:02:00.000Z", samples: 1, tempMinC: 7.25, tempMaxC: 7.25, tempMeanC: 7.25, rhMean: 70 },
    ]);
  });

  it("summarises a minute again when readings for it arrive late (after an outage)", async () => {
    const sensorId = site.sensorId;
    store.add({ sensorId, at: at(1, 30), tempC: 9.5, rh: 60, battery: 0.9 });
    await store.flush();
    clock = t0 + 5 * 60_000;
    await store.rollUp();
    const rows = await minutesOf();
    expect(rows.find((r) => r.minute.getTime() === at(1, 0).getTime())).toMatchObject({ samples: 2, tempMinC: 3.5, tempMaxC: 9.5, tempMeanC: 6.5, rhMean: 60 });
    // The minute that was running last time is now whole.
    expect(rows.find((r) => r.minute.getTime() === at(3, 0).getTime())).toMatchObject({ samples: 1, tempMeanC: 8 });
    expect(rows).toHaveLength(4); // 10:04 had no reading, so it has no row
  });

  it("deletes raw rows past the retention and keeps their summaries", async () => {
    clock = t0 + HOUR + 2 * 60_000 + 30_000; // raw rows before 10:02:30 go
    await store.rollUp();
    const left = await getDb()
      .select({ at: readings.at })
      .from(readings)
      .where(eq(readings.sensorId, site.sensorId))
      .orderBy(asc(readings.at));
    expect(left.map((r) => r.at.toISOString())).toEqual(["2026-11-25T10:02:59.999Z", "2026-11-25T10:03:01.000Z"]);
    const rows = await minutesOf();
    expect(rows.map((r) => r.samples)).toEqual([3, 2, 1, 1]);
  });

  it("records when a device was last seen and whether it is online", async () => {
    store.sensorSeen(site.sensorId, true, at(70, 0));
    await store.flush();
    const [row] = await getDb()
      .select({ online: sensorStates.online, lastSeenAt: sensorStates.lastSeenAt })
      .from(sensorStates)
      .where(and(eq(sensorStates.sensorId, site.sensorId)));
    expect(row).toEqual({ online: true, lastSeenAt: at(70, 0) });
    store.sensorSeen(site.sensorId, false, at(71, 0));
    await store.flush();
    const [after] = await getDb().select({ online: sensorStates.online }).from(sensorStates).where(eq(sensorStates.sensorId, site.sensorId));
    expect(after!.online).toBe(false);
  });
});
