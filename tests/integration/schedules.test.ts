// A plug's weekly plan through its route handlers: saved whole, read back, refused with
// field messages when wrong (and then nothing is written), audited, and acted on by the
// controller at once.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, asc, desc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { getDb } from "@/db/client";
import { auditLog, memberships, plugs, scheduleExceptions, scheduleWindows, schedules } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import type { PlugDevice } from "@/fakes/plug-device";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { setWakeBroker } from "@/lib/server/wake";
import * as scheduleRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/schedule/route";
import * as previewRoute from "@/app/api/sites/[siteId]/plugs/[plugId]/schedule/preview/route";
import type { Preview } from "@/lib/schedules/preview";
import { connectAs, createControlSite, eventually, startTestHeater, testControllerOptions, type ControlSite } from "../support/control-site";
import { call, signUp, type Account } from "../support/http";

let site: ControlSite;
let elsewhere: ControlSite;
let controller: Controller;
let heater: PlugDevice;
let sensor: MqttClient;
const people: Record<"grower" | "helper" | "viewer", Account> = {} as never;

const EVERY_DAY = ["MO", "TU", "WE", "TH", "FR", "SA", "SU"];
const goodPlan = {
  name: "Winter days",
  windows: [
    { days: EVERY_DAY, start: "06:00", durationMin: 16 * 60, mode: "band", lowC: 20, highC: 25 },
    { days: ["MO", "TU", "WE", "TH", "FR"], start: "22:00", durationMin: 8 * 60, mode: "band", lowC: 10, highC: 12 },
  ],
  outsideWindows: "frost",
  frostLowC: 3,
  frostHighC: 5,
  validFrom: "2026-10-01",
  validUntil: "2027-04-30",
  skipDays: [{ day: "2026-12-25", note: "Away for Christmas" }],
};

const params = () => ({ siteId: site.siteId, plugId: site.heaterId });
const put = (body: unknown, who: Account = people.grower, p = params()) =>
  call(scheduleRoute.PUT, { method: "PUT", path: "/x", params: p, body, cookie: who.cookie });
const get = (who: Account = people.grower, p = params()) => call(scheduleRoute.GET, { path: "/x", params: p, cookie: who.cookie });

async function storedRows(plugId = site.heaterId) {
  const db = getDb();
  const scheduleRows = await db.select().from(schedules).where(eq(schedules.plugId, plugId)).orderBy(asc(schedules.id));
  const windows = await db
    .select({ w: scheduleWindows })
    .from(scheduleWindows)
    .innerJoin(schedules, eq(schedules.id, scheduleWindows.scheduleId))
    .where(eq(schedules.plugId, plugId))
    .orderBy(asc(scheduleWindows.id));
  const skips = await db
    .select({ e: scheduleExceptions })
    .from(scheduleExceptions)
    .innerJoin(schedules, eq(schedules.id, scheduleExceptions.scheduleId))
    .where(eq(schedules.plugId, plugId));
  const [plug] = await db.select().from(plugs).where(eq(plugs.id, plugId));
  return { scheduleRows, windows, skips, plug };
}

beforeAll(async () => {
  const db = getDb();
  // The heater's fail-safe is off and its sensor is never stale here: only the plan switches it.
  site = await createControlSite(db, { staleAfterS: 3600, failsafe: "off" });
  elsewhere = await createControlSite(db);
  for (const role of ["grower", "helper", "viewer"] as const) {
    people[role] = await signUp();
    await db.insert(memberships).values({ siteId: site.siteId, userId: people[role].userId, role });
  }
  const options = testControllerOptions(site, { configReloadMs: 3600_000 });
  controller = await createController(options);
  await setWakeBroker({ url: controller.mqttUrl, secret: options.webappSecret });
  heater = await startTestHeater(site, controller.mqttUrl);
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  // 15 °C is above the site's all-day 10–12 °C band: the heater stays off.
  await sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: 15, rh: 80, at: new Date().toISOString() }), { qos: 1 });
  await controller.flush();
});

afterAll(async () => {
  await setWakeBroker(null);
  await sensor?.endAsync();
  await heater?.close();
  await controller?.close();
});

describe("the plug's plan", () => {
  it("reads the stored schedule as a weekly plan, in the site's zone", async () => {
    const response = await get(people.viewer);
    expect(response.status).toBe(200);
    const body = (await response.json()) as { timeZone: string; plan: { windows: unknown[] }; scheduleCount: number };
    expect(body.timeZone).toBe("Europe/London");
    expect(body.scheduleCount).toBe(1);
    // createControlSite's FREQ=DAILY window is every day of the week.
    expect(body.plan.windows).toEqual([expect.objectContaining({ days: EVERY_DAY, start: "00:00", durationMin: 1440, mode: "band", lowC: 10, highC: 12 })]);
  });

  it("a grower saves a plan: read back whole, audited with before and after", async () => {
    const response = await put(goodPlan);
    expect(response.status).toBe(200);
    const read = (await (await get()).json()) as { plan: typeof goodPlan };
    expect(read.plan).toEqual({
      ...goodPlan,
      windows: goodPlan.windows.map((w) => ({ ...w, id: expect.any(String) })),
    });

    const { scheduleRows, windows, skips, plug } = await storedRows();
    expect(scheduleRows).toHaveLength(1);
    expect(scheduleRows[0]).toMatchObject({ name: "Winter days", validFrom: "2026-10-01", validUntil: "2027-04-30" });
    expect(windows.map((w) => w.w.recurrence).sort()).toEqual(["FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR", "FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR,SA,SU"]);
    expect(skips.map((s) => [s.e.day, s.e.note])).toEqual([["2026-12-25", "Away for Christmas"]]);
    expect(plug).toMatchObject({ outsideWindows: "frost", frostLowC: 3, frostHighC: 5 });

    const [audit] = await getDb()
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.siteId, site.siteId), eq(auditLog.entityId, site.heaterId)))
      .orderBy(desc(auditLog.id))
      .limit(1);
    expect(audit).toMatchObject({ action: "schedule.update", entityType: "plug", userId: people.grower.userId });
    // Windows and skip days in words, so the activity page shows what changed.
    expect((audit!.before as { windows: string[] }).windows).toEqual([expect.stringContaining("10–12 °C")]);
    const after = audit!.after as { windows: string[]; skipDays: string[]; frostLowC: number };
    expect(after.windows).toEqual([expect.stringMatching(/06:00.*20–25 °C$/), expect.stringMatching(/^Mon–Fri 22:00.*10–12 °C$/)]);
    expect(after.skipDays).toEqual(["2026-12-25 (Away for Christmas)"]);
    expect(after.frostLowC).toBe(3);

  });

  it("the controller acts on a saved plan at once: its wake-up reloads the site", async () => {
    const allDay = (lowC: number, highC: number) => ({
      ...goodPlan,
      windows: [{ days: EVERY_DAY, start: "00:00", durationMin: 1440, mode: "band", lowC, highC }],
      validFrom: null,
      validUntil: null,
      skipDays: [],
    });
    // 15 °C: at or below a 20–25 °C band's low edge (heat), above a 10–12 °C band's high edge (off).
    let started = Date.now();
    expect((await put(allDay(20, 25))).status).toBe(200);
    await eventually(() => heater.on, 1000 - (Date.now() - started), "heater on within 1 s of the save");
    started = Date.now();
    expect((await put(allDay(10, 12))).status).toBe(200);
    await eventually(() => !heater.on, 1000 - (Date.now() - started), "heater off within 1 s of the save");
    expect((await put(goodPlan)).status).toBe(200);
  });

  it("refuses overlapping windows with a message naming the other window and the day, and writes nothing", async () => {
    const before = await storedRows();
    const auditBefore = await getDb().select().from(auditLog).where(eq(auditLog.siteId, site.siteId));
    const response = await put({
      ...goodPlan,
      windows: [goodPlan.windows[0], { ...goodPlan.windows[1], start: "21:00" }],
    });
    expect(response.status).toBe(400);
    const { error } = (await response.json()) as { error: { code: string; fields: Record<string, string> } };
    expect(error.code).toBe("bad_input");
    expect(error.fields["windows.1"]).toBe(
      "Runs at the same time as window 1 (Every day 06:00–22:00) on Monday. Windows may touch but not overlap",
    );
    expect(await storedRows()).toEqual(before);
    expect(await getDb().select().from(auditLog).where(eq(auditLog.siteId, site.siteId))).toEqual(auditBefore);
  });

  it("refuses a band with its edges the wrong way round or too close, by field", async () => {
    const before = await storedRows();
    const response = await put({
      ...goodPlan,
      windows: [{ ...goodPlan.windows[0], lowC: 20, highC: 20.5 }],
      frostLowC: 5,
      frostHighC: 3,
    });
    expect(response.status).toBe(400);
    const { error } = (await response.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields["windows.0.highC"]).toMatch(/at least 1 °C/);
    expect(error.fields.frostHighC).toBe("The high edge must be above the low edge");
    expect(await storedRows()).toEqual(before);
  });

  it("refuses a band outside the house's limits, naming the limit, and writes nothing", async () => {
    // createControlSite's house: cut-out 30 °C, frost limit the default 2 °C.
    const before = await storedRows();
    const response = await put({ ...goodPlan, windows: [{ ...goodPlan.windows[0], lowC: 28, highC: 31 }], frostLowC: 1, frostHighC: 4 });
    expect(response.status).toBe(400);
    const { error } = (await response.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields["windows.0.highC"]).toBe("The high edge must be below this house's safety cut-out of 30.0 °C (86.0 °F)");
    expect(error.fields.frostLowC).toBe("The low edge is below this house's frost limit of 2.0 °C (35.6 °F)");
    expect(await storedRows()).toEqual(before);
  });

  it("a helper and a viewer may read but not save", async () => {
    const before = await storedRows();
    for (const who of [people.helper, people.viewer]) {
      expect((await get(who)).status).toBe(200);
      const response = await put(goodPlan, who);
      expect(response.status).toBe(403);
    }
    expect(await storedRows()).toEqual(before);
  });

  it("another site's plug is a 404, through one's own site too", async () => {
    expect((await get(people.grower, { siteId: site.siteId, plugId: elsewhere.heaterId })).status).toBe(404);
    expect((await put(goodPlan, people.grower, { siteId: site.siteId, plugId: elsewhere.heaterId })).status).toBe(404);
    expect((await storedRows(elsewhere.heaterId)).windows).toHaveLength(1);
  });

  it("a retired plug has no schedule to edit (409)", async () => {
    await getDb().update(plugs).set({ retiredAt: new Date() }).where(eq(plugs.id, site.lightId));
    const response = await put(goodPlan, people.grower, { siteId: site.siteId, plugId: site.lightId });
    expect(response.status).toBe(409);
    expect(((await response.json()) as { error: { message: string } }).error.message).toMatch(/retired/);
    await getDb().update(plugs).set({ retiredAt: null }).where(eq(plugs.id, site.lightId));
  });

  it("a plug with several schedules is shown as one plan and saved as one", async () => {
    const db = getDb();
    const first = "00000000-0000-4000-8000-000000000001";
    const second = "00000000-0000-4000-8000-000000000002";
    await db.insert(schedules).values([
      { id: first, plugId: site.lightId, name: "Mornings", createdAt: new Date("2026-01-01T00:00:00Z") },
      { id: second, plugId: site.lightId, name: "Evenings", createdAt: new Date("2026-01-02T00:00:00Z") },
    ]);
    await db.insert(scheduleWindows).values([
      { scheduleId: first, recurrence: "FREQ=WEEKLY;BYDAY=MO", startsAt: "06:00:00", durationMin: 120, mode: "on" },
      { scheduleId: second, recurrence: "FREQ=WEEKLY;BYDAY=MO", startsAt: "18:00:00", durationMin: 120, mode: "on" },
    ]);
    const lightParams = { siteId: site.siteId, plugId: site.lightId };
    const read = (await (await get(people.grower, lightParams)).json()) as { scheduleCount: number; plan: typeof goodPlan };
    expect(read.scheduleCount).toBe(2);
    expect(read.plan.name).toBe("Mornings");
    expect(read.plan.windows.map((w) => w.start)).toEqual(["06:00", "18:00"]);
    expect((await put({ ...read.plan, outsideWindows: "off", frostLowC: null, frostHighC: null }, people.grower, lightParams)).status).toBe(200);
    const after = await storedRows(site.lightId);
    expect(after.scheduleRows.map((s) => s.id)).toEqual([first]);
    expect(after.windows).toHaveLength(2);
  });
});

describe("the preview", () => {
  // Europe/London follows the EU rule in the IANA tz database (Directive 2000/84/EC):
  // clocks go forward at 01:00 UTC on the last Sunday of March (2027-03-28) and back at
  // 01:00 UTC on the last Sunday of October (2027-10-31).
  const lights = {
    ...goodPlan,
    windows: [{ days: EVERY_DAY, start: "18:00", durationMin: 120, mode: "on", lowC: null, highC: null }],
    outsideWindows: "off",
    frostLowC: null,
    frostHighC: null,
    validFrom: null,
    validUntil: null,
    skipDays: [],
  };
  const preview = async (from: string, hours: number) => {
    const response = await call(previewRoute.POST, {
      method: "POST",
      path: "/x",
      params: params(),
      body: { from, hours, plan: lights },
      cookie: people.viewer.cookie,
    });
    expect(response.status).toBe(200);
    return (await response.json()) as Preview;
  };
  const onPeriods = (p: Preview) => p.segments.filter((s) => s.rule.kind === "window").map((s) => [s.from, s.until]);

  it("a window at 18:00 local stays at 18:00 local when the clocks go forward; the day has 23 hours", async () => {
    const p = await preview("2027-03-27T00:00:00.000Z", 72);
    expect(onPeriods(p)).toEqual([
      ["2027-03-27T18:00:00.000Z", "2027-03-27T20:00:00.000Z"], // GMT
      ["2027-03-28T17:00:00.000Z", "2027-03-28T19:00:00.000Z"], // BST, UTC+1
      ["2027-03-29T17:00:00.000Z", "2027-03-29T19:00:00.000Z"],
    ]);
    expect(p.clockChanges).toEqual([{ date: "2027-03-28", hours: 23 }]);
    expect(p.segments[0]).toMatchObject({ rule: { kind: "off" }, windowIndex: null });
    expect(p.segments[1]).toMatchObject({ windowIndex: 0 });
  });

  it("and when they go back; the day has 25 hours", async () => {
    const p = await preview("2027-10-30T00:00:00.000Z", 48);
    expect(onPeriods(p)).toEqual([
      ["2027-10-30T17:00:00.000Z", "2027-10-30T19:00:00.000Z"], // BST
      ["2027-10-31T18:00:00.000Z", "2027-10-31T20:00:00.000Z"], // GMT
    ]);
    expect(p.clockChanges).toEqual([{ date: "2027-10-31", hours: 25 }]);
  });

  it("shows the draft, not the saved plan, and refuses a bad draft or range with field messages", async () => {
    const saved = (await (await get()).json()) as { plan: unknown };
    const p = await preview("2027-01-04T00:00:00.000Z", 24);
    expect(onPeriods(p)).toEqual([["2027-01-04T18:00:00.000Z", "2027-01-04T20:00:00.000Z"]]);
    expect(((await (await get()).json()) as { plan: unknown }).plan).toEqual(saved.plan);

    const bad = await call(previewRoute.POST, {
      method: "POST",
      path: "/x",
      params: params(),
      body: { hours: 200, plan: { ...lights, windows: [{ ...lights.windows[0], days: [] }] } },
      cookie: people.grower.cookie,
    });
    expect(bad.status).toBe(400);
    const { error } = (await bad.json()) as { error: { fields: Record<string, string> } };
    expect(error.fields).toMatchObject({ hours: "hours must be from 24 to 168", "plan.windows.0.days": "Pick at least one day" });
  });
});
