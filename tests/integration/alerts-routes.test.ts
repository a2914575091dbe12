// The alerts pages' handlers on MariaDB: the list with each alert's e-mails, keyset
// pages and filters; acknowledging; a house's rules saved, audited and waking the
// controller; each member's own e-mails; the daily summary time. Bad input is a 400
// naming the field and changes nothing.
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { alertPreferences, alerts, auditLog, houseAlertRules, houses, memberships, outboundMail, plugs, sensors, sites } from "@/db/schema";
import { DEMO_SITE, seedDemo } from "@/db/seed";
import { DEFAULT_ALERT_RULES } from "@/lib/alerts/rules";
import * as sitesRoute from "@/app/api/sites/route";
import * as alertsRoute from "@/app/api/sites/[siteId]/alerts/route";
import * as acknowledgeRoute from "@/app/api/sites/[siteId]/alerts/[alertId]/acknowledge/route";
import * as rulesRoute from "@/app/api/sites/[siteId]/alerts/rules/[houseId]/route";
import * as preferencesRoute from "@/app/api/sites/[siteId]/alerts/preferences/route";
import * as summaryRoute from "@/app/api/sites/[siteId]/alerts/summary-time/route";
import { call, signUp, type Account } from "../support/http";

const wakes = vi.hoisted(() => [] as { slug: string; payload: unknown }[]);
vi.mock("@/lib/server/wake", () => ({
  wakeController: async (slug: string, payload: unknown) => {
    wakes.push({ slug, payload });
    return true;
  },
}));

type Json = Record<string, unknown> & { error?: { code: string; message: string; fields?: Record<string, string> } };
const json = async (r: Response) => (await r.json()) as Json;

const people: Record<"owner" | "grower" | "helper" | "viewer", Account> = {} as never;
let siteId: string;
let siteSlug: string;
let glassId: string;
let tunnelId: string;
let sensorId: string;
let plugId: string;
let otherAlertId: number;

const at = (iso: string) => new Date(iso);

async function insertAlert(values: Partial<typeof alerts.$inferInsert> & { raisedAt: Date }) {
  const [result] = await getDb()
    .insert(alerts)
    .values({ siteId, houseId: glassId, kind: "too_cold", message: "Colder than the frost alert temperature", ...values });
  return result.insertId;
}

async function auditOf(action: string, entityId: string) {
  return getDb()
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.siteId, siteId), eq(auditLog.action, action), eq(auditLog.entityId, entityId)));
}

beforeAll(async () => {
  const db = getDb();
  await seedDemo(db);
  people.owner = await signUp({ siteName: "Alert Acre", timeZone: "Europe/London", currency: "GBP" });
  const listed = await json(await call(sitesRoute.GET, { path: "/api/sites", cookie: people.owner.cookie }));
  const site = (listed.sites as { id: string; slug: string }[])[0]!;
  siteId = site.id;
  siteSlug = site.slug;
  for (const role of ["grower", "helper", "viewer"] as const) {
    people[role] = await signUp();
    await db.insert(memberships).values({ siteId, userId: people[role].userId, role });
  }
  glassId = randomUUID();
  tunnelId = randomUUID();
  sensorId = randomUUID();
  plugId = randomUUID();
  const shape = { kind: "glasshouse" as const, lengthM: 3, widthM: 2, eaveHeightM: 2, ridgeHeightM: 2.5, glazing: "single_glass" as const };
  await db.insert(houses).values([
    { id: glassId, siteId, name: "Glasshouse", ...shape, lowLimitC: 3 },
    { id: tunnelId, siteId, name: "Tunnel", ...shape },
  ]);
  await db.insert(sensors).values({ id: sensorId, siteId, houseId: glassId, deviceId: "air-1", name: "Bench sensor" });
  await db.insert(plugs).values({ id: plugId, siteId, houseId: glassId, deviceId: "heater-1", name: "Fan heater", applianceKind: "heater", applianceWatts: 2000, ratedCurrentA: 13 });
  const [other] = await db
    .insert(alerts)
    .values({ siteId: DEMO_SITE.id, kind: "sensor_quiet", message: "No readings", raisedAt: at("2026-01-10T02:00:00Z") });
  otherAlertId = other.insertId;
});

beforeEach(() => {
  wakes.length = 0;
});

const list = (query: string, cookie = people.viewer.cookie) =>
  call(alertsRoute.GET, { path: `/api/sites/${siteId}/alerts?${query}`, params: { siteId }, cookie });
const acknowledge = (alertId: number | string, cookie: string) =>
  call(acknowledgeRoute.POST, { method: "POST", path: "/x", params: { siteId, alertId: String(alertId) }, cookie });

describe("the alerts list", () => {
  let frostId: number;
  let silentId: number;
  let warmId: number;

  beforeAll(async () => {
    frostId = await insertAlert({
      sensorId,
      raisedAt: at("2026-01-12T02:10:00Z"),
      detail: { valueC: 1.4, limitC: 3, hysteresisK: 0.5, lastedMin: 2 },
    });
    silentId = await insertAlert({ kind: "sensor_quiet", sensorId, message: "No readings from the sensor", raisedAt: at("2026-01-12T01:00:00Z") });
    warmId = await insertAlert({
      kind: "too_warm",
      houseId: tunnelId,
      message: "Warmer than the too-warm temperature",
      raisedAt: at("2026-01-11T13:00:00Z"),
      clearedAt: at("2026-01-11T15:30:00Z"),
      clearedMessage: "Back below the too-warm temperature",
      detail: { valueC: 33.1, limitC: 32, cleared: { valueC: 31.2, at: "2026-01-11T15:30:00Z" } },
    });
    const mail = (alertId: number, values: Partial<typeof outboundMail.$inferInsert>) => ({
      siteId,
      userId: people.grower.userId,
      toAddress: people.grower.email,
      purpose: "alert_raised" as const,
      alertId,
      dedupeKey: `test:${randomUUID()}`,
      subject: "Frost risk",
      bodyText: "…",
      dueAt: at("2026-01-12T02:10:00Z"),
      createdAt: at("2026-01-12T02:10:00Z"),
      ...values,
    });
    await getDb()
      .insert(outboundMail)
      .values([
        mail(frostId, { status: "sent", attempts: 1, sentAt: at("2026-01-12T02:13:00Z") }),
        mail(frostId, { toAddress: people.helper.email, userId: people.helper.userId, status: "waiting", attempts: 3, lastError: "Connection refused", dueAt: at("2026-01-12T02:20:00Z") }),
        mail(silentId, { status: "held", dueAt: at("2026-01-12T07:00:00Z") }),
      ]);
  });

  it("gives open alerts newest first with names, figures in °C and every e-mail with how it stands", async () => {
    const response = await list("status=open");
    expect(response.status).toBe(200);
    const page = (await json(response)) as unknown as { alerts: Record<string, unknown>[]; nextCursor: string | null };
    expect(page.alerts.map((a) => a.id)).toEqual([frostId, silentId]);
    expect(page.nextCursor).toBeNull();
    const frost = page.alerts[0]!;
    expect(frost).toMatchObject({
      kind: "too_cold",
      house: { id: glassId, name: "Glasshouse" },
      sensor: { id: sensorId, name: "Bench sensor" },
      plug: null,
      raisedAt: "2026-01-12T02:10:00.000Z",
      clearedAt: null,
      acknowledgedAt: null,
      detail: { valueC: 1.4, limitC: 3, hysteresisK: 0.5, lastedMin: 2 },
    });
    expect(frost.deliveries).toEqual([
      expect.objectContaining({ to: people.grower.email, name: "Test Grower", status: "sent", attempts: 1, sentAt: "2026-01-12T02:13:00.000Z" }),
      expect.objectContaining({ to: people.helper.email, status: "waiting", attempts: 3, lastError: "Connection refused", dueAt: "2026-01-12T02:20:00.000Z", sentAt: null }),
    ]);
    expect(page.alerts[1]!.deliveries).toEqual([expect.objectContaining({ status: "held", dueAt: "2026-01-12T07:00:00.000Z" })]);
  });

  it("gives past alerts with their back-to-normal words, and filters by house and kind", async () => {
    const past = (await json(await list("status=past"))) as unknown as { alerts: { id: number; clearedMessage: string; clearedAt: string }[] };
    expect(past.alerts).toEqual([expect.objectContaining({ id: warmId, clearedMessage: "Back below the too-warm temperature", clearedAt: "2026-01-11T15:30:00.000Z" })]);
    const byHouse = (await json(await list(`status=past&houseId=${glassId}`))) as unknown as { alerts: unknown[] };
    expect(byHouse.alerts).toEqual([]);
    const byKind = (await json(await list("status=open&kind=sensor_quiet"))) as unknown as { alerts: { id: number }[] };
    expect(byKind.alerts.map((a) => a.id)).toEqual([silentId]);
  });

  it("pages by cursor without repeats or gaps, including alerts raised at the same instant", async () => {
    const same = at("2026-01-09T10:00:00Z");
    const ids = [];
    for (let i = 0; i < 3; i++) ids.push(await insertAlert({ kind: "battery_low", houseId: tunnelId, raisedAt: same, clearedAt: at("2026-01-09T12:00:00Z") }));
    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const page = (await json(await list(`status=past&kind=battery_low&limit=2${cursor ? `&cursor=${cursor}` : ""}`))) as unknown as { alerts: { id: number }[]; nextCursor: string | null };
      seen.push(...page.alerts.map((a) => a.id));
      cursor = page.nextCursor;
    } while (cursor);
    expect(seen).toEqual([...ids].sort((a, b) => b - a));
  });

  it("never shows another site's alerts", async () => {
    const all = [
      ...((await json(await list("status=open"))).alerts as { id: number }[]),
      ...((await json(await list("status=past&limit=100"))).alerts as { id: number }[]),
    ];
    expect(all.map((a) => a.id)).not.toContain(otherAlertId);
  });

  it.each([
    ["status=closed", "status"],
    ["kind=hail", "kind"],
    ["houseId=abc", "houseId"],
    ["cursor=s1abc-1", "cursor"],
    ["limit=0", "limit"],
  ])("refuses %s with a 400 naming %s", async (query, field) => {
    const response = await list(query);
    expect(response.status).toBe(400);
    expect(Object.keys((await json(response)).error!.fields!)).toEqual([field]);
  });
});

describe("acknowledging", () => {
  it("records who saw it once; a second press changes nothing; a viewer is refused", async () => {
    const id = await insertAlert({ kind: "plug_offline", plugId, raisedAt: at("2026-01-13T03:00:00Z") });
    const refused = await acknowledge(id, people.viewer.cookie);
    expect(refused.status).toBe(403);
    expect((await getDb().select().from(alerts).where(eq(alerts.id, id)))[0]!.acknowledgedAt).toBeNull();

    const first = await acknowledge(id, people.helper.cookie);
    expect(first.status).toBe(200);
    const ack = (await json(first)).acknowledgement as { acknowledgedBy: string; already: boolean; acknowledgedAt: string };
    expect(ack).toMatchObject({ acknowledgedBy: "Test Grower", already: false });
    const [row] = await getDb().select().from(alerts).where(eq(alerts.id, id));
    expect(row!.acknowledgedBy).toBe(people.helper.userId);
    const audits = await auditOf("alert.acknowledge", String(id));
    expect(audits).toHaveLength(1);
    expect(audits[0]!.after).toMatchObject({ name: "Plug offline in Glasshouse" });

    const second = await acknowledge(id, people.grower.cookie);
    expect(second.status).toBe(200);
    expect((await json(second)).acknowledgement).toMatchObject({ already: true, acknowledgedAt: ack.acknowledgedAt });
    expect((await getDb().select().from(alerts).where(eq(alerts.id, id)))[0]!.acknowledgedBy).toBe(people.helper.userId);
    expect(await auditOf("alert.acknowledge", String(id))).toHaveLength(1);

    const listed = (await json(await list("status=open&kind=plug_offline"))).alerts as { acknowledgedBy: string }[];
    expect(listed[0]!.acknowledgedBy).toBe("Test Grower");
  });

  it("refuses a cleared alert (409), hides another site's (404) and names a bad number (400)", async () => {
    const cleared = await insertAlert({ raisedAt: at("2026-01-13T04:00:00Z"), clearedAt: at("2026-01-13T04:30:00Z") });
    const conflict = await acknowledge(cleared, people.grower.cookie);
    expect(conflict.status).toBe(409);
    expect((await getDb().select().from(alerts).where(eq(alerts.id, cleared)))[0]!.acknowledgedAt).toBeNull();
    expect((await acknowledge(otherAlertId, people.owner.cookie)).status).toBe(404);
    const bad = await acknowledge("first", people.owner.cookie);
    expect(bad.status).toBe(400);
    expect(Object.keys((await json(bad)).error!.fields!)).toEqual(["alertId"]);
  });
});

describe("a house's alert rules", () => {
  const rulesOf = (houseId: string, cookie: string) => call(rulesRoute.GET, { path: "/x", params: { siteId, houseId }, cookie });
  const save = (houseId: string, body: unknown, cookie: string) => call(rulesRoute.PUT, { method: "PUT", path: "/x", params: { siteId, houseId }, body, cookie });

  it("starts with the defaults, saves whole with an audit entry, and wakes the controller", async () => {
    const first = await json(await rulesOf(tunnelId, people.viewer.cookie));
    expect(first.house).toMatchObject({ name: "Tunnel", saved: false, rules: DEFAULT_ALERT_RULES, lowLimitC: 2 });

    const changed = { ...DEFAULT_ALERT_RULES, frost: { belowC: 1.5, holdMin: 5 }, hysteresisK: 1, heaterLongOn: { enabled: false, afterHours: 8 } };
    const response = await save(tunnelId, changed, people.grower.cookie);
    expect(response.status).toBe(200);
    const [row] = await getDb().select().from(houseAlertRules).where(eq(houseAlertRules.houseId, tunnelId));
    expect(row!.rules).toEqual(changed);
    expect(row!.updatedBy).toBe(people.grower.userId);
    const [audit] = await auditOf("alert_rules.update", tunnelId);
    expect(audit!.before).toMatchObject({ name: "Tunnel", hysteresisK: 0.5, frost: { belowC: null } });
    expect(audit!.after).toMatchObject({ name: "Tunnel", hysteresisK: 1, frost: { belowC: 1.5, holdMin: 5 } });
    expect(wakes).toEqual([{ slug: siteSlug, payload: { reason: "house" } }]);
    expect((await json(await rulesOf(tunnelId, people.helper.cookie))).house).toMatchObject({ saved: true, rules: changed });
  });

  it("refuses a helper (403), bad rules (400 naming the field) and another site's house (404), writing nothing", async () => {
    expect((await save(glassId, DEFAULT_ALERT_RULES, people.helper.cookie)).status).toBe(403);
    const bad = await save(glassId, { ...DEFAULT_ALERT_RULES, tooWarm: { enabled: true, aboveC: 75, holdMin: 10 } }, people.owner.cookie);
    expect(bad.status).toBe(400);
    expect((await json(bad)).error!.fields).toEqual({ "tooWarm.aboveC": "Too-warm temperature must be at most 60 °C (140 °F)" });
    const missing = await save(glassId, { ...DEFAULT_ALERT_RULES, reminderMin: undefined }, people.owner.cookie);
    expect(Object.keys((await json(missing)).error!.fields!)).toEqual(["reminderMin"]);
    const demoHouse = (await getDb().select({ id: houses.id }).from(houses).where(eq(houses.siteId, DEMO_SITE.id)))[0]!.id;
    expect((await save(demoHouse, DEFAULT_ALERT_RULES, people.owner.cookie)).status).toBe(404);
    expect(await getDb().select().from(houseAlertRules).where(eq(houseAlertRules.houseId, glassId))).toEqual([]);
    expect(await getDb().select().from(houseAlertRules).where(eq(houseAlertRules.houseId, demoHouse))).toEqual([]);
    expect(wakes).toEqual([]);
  });
});

describe("my alert e-mails", () => {
  const mine = (cookie: string) => call(preferencesRoute.GET, { path: "/x", params: { siteId }, cookie });
  const save = (body: unknown, cookie: string) => call(preferencesRoute.PUT, { method: "PUT", path: "/x", params: { siteId }, body, cookie });
  const stored = (userId: string) => getDb().select().from(alertPreferences).where(and(eq(alertPreferences.siteId, siteId), eq(alertPreferences.userId, userId)));

  it("starts with the role's defaults and saves each member's own choice, a viewer's too", async () => {
    expect(await json(await mine(people.helper.cookie))).toMatchObject({ chosen: false, preferences: { kinds: ["too_warm", "too_hot", "controller_silent", "plug_offline", "heater_long_on"] } });
    const choice = { kinds: ["condensation", "sensor_quiet", "condensation"], quietFrom: "22:30", quietUntil: "06:45", dailySummary: true };
    const response = await save(choice, people.viewer.cookie);
    expect(response.status).toBe(200);
    const [row] = await stored(people.viewer.userId);
    expect(row).toMatchObject({ kinds: ["condensation", "sensor_quiet"], quietFrom: "22:30", quietUntil: "06:45", dailySummary: true });
    const [audit] = await auditOf("alert_preferences.update", people.viewer.userId);
    expect(audit!.before).toMatchObject({ kinds: [], dailySummary: false });
    expect(audit!.after).toMatchObject({ kinds: ["condensation", "sensor_quiet"], quietFrom: "22:30" });
    expect(await json(await mine(people.viewer.cookie))).toMatchObject({ chosen: true, preferences: { quietUntil: "06:45" } });
    // Nobody else's choice moved.
    expect(await stored(people.helper.userId)).toEqual([]);
  });

  it.each([
    [{ kinds: [], quietFrom: "22:00", quietUntil: null, dailySummary: false }, "quietUntil"],
    [{ kinds: [], quietFrom: null, quietUntil: "07:00", dailySummary: false }, "quietFrom"],
    [{ kinds: [], quietFrom: "22:00", quietUntil: "22:00", dailySummary: false }, "quietUntil"],
    [{ kinds: [], quietFrom: "24:00", quietUntil: "07:00", dailySummary: false }, "quietFrom"],
    [{ kinds: ["too_cold"], quietFrom: null, quietUntil: null, dailySummary: false }, "kinds.0"],
    [{ kinds: [], quietFrom: null, quietUntil: null, dailySummary: "yes" }, "dailySummary"],
  ])("refuses %j with a 400 naming %s and stores nothing", async (body, field) => {
    const response = await save(body, people.grower.cookie);
    expect(response.status).toBe(400);
    expect(Object.keys((await json(response)).error!.fields!)).toEqual([field]);
    expect(await stored(people.grower.userId)).toEqual([]);
  });
});

describe("the daily summary time", () => {
  const save = (body: unknown, cookie = people.owner.cookie) => call(summaryRoute.PUT, { method: "PUT", path: "/x", params: { siteId }, body, cookie });
  const summaryTime = async () => (await getDb().select({ t: sites.summaryTime }).from(sites).where(eq(sites.id, siteId)))[0]!.t;

  it("is the owner's: set, then turned off, each audited as site.summary", async () => {
    expect((await save({ summaryTime: "18:30" })).status).toBe(200);
    expect(await summaryTime()).toBe("18:30");
    expect((await save({ summaryTime: null })).status).toBe(200);
    expect(await summaryTime()).toBeNull();
    const audits = await auditOf("site.summary", siteId);
    expect(audits.map((a) => [a.before, a.after])).toEqual([
      [expect.objectContaining({ summaryTime: null }), expect.objectContaining({ summaryTime: "18:30" })],
      [expect.objectContaining({ summaryTime: "18:30" }), expect.objectContaining({ summaryTime: null })],
    ]);
  });

  it("refuses a grower (403) and a time that is not HH:MM (400), changing nothing", async () => {
    await save({ summaryTime: "07:00" });
    expect((await save({ summaryTime: "08:00" }, people.grower.cookie)).status).toBe(403);
    for (const bad of ["7:00", "25:00", "", 700]) {
      const response = await save({ summaryTime: bad });
      expect(response.status).toBe(400);
      expect(Object.keys((await json(response)).error!.fields!)).toEqual(["summaryTime"]);
    }
    expect(await summaryTime()).toBe("07:00");
  });
});
