// Alert e-mails through the real MariaDB and a real SMTP sink (fakes/mail-sink.ts) of
// this file's own, so it can be stopped and started again. Alerts are inserted as the
// controller writes them; the notifier's clock is injected.
import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb, getPool } from "@/db/client";
import { claimMail } from "@/db/queries/alert-outbox";
import { alertNotices, alerts, controllerHeartbeats, houseAlertRules, outboundMail } from "@/db/schema";
import { startMailSink, type MailSink } from "@/fakes/mail-sink";
import { NOTIFIER_LOCK } from "@/lib/server/alerts/lock";
import { createNotifier, type Notifier, type NotifierOptions } from "@/lib/server/alerts/notifier";
import { SKIPPED_AFTER_QUIET_HOURS } from "@/lib/server/alerts/send";
import { listMail, readMail, type MailMessage } from "@/lib/server/mailbox";
import { clearAlert, createAlertSite, insertAlert, outboxOf, quietNotifierLogger } from "../support/alert-site";

// Far from the real clock, so no other test's controller heartbeat counts as recent.
// London is on GMT in January: local time equals UTC.
const T = new Date("2031-01-14T12:00:00Z");
const at = (iso: string) => new Date(iso);
const plusMin = (d: Date, min: number) => new Date(d.getTime() + min * 60_000);

let sink: MailSink;
let folder: string;
const saved = { url: process.env.CLOCHE_SMTP_URL, dir: process.env.CLOCHE_MAIL_SINK_DIR };
const notifiers: Notifier[] = [];

beforeAll(async () => {
  folder = mkdtempSync(path.join(os.tmpdir(), "cloche-alert-mail-"));
  sink = await startMailSink({ port: 0, folder });
  // Before anything reads the environment: this file's mail goes to its own sink.
  process.env.CLOCHE_SMTP_URL = sink.url;
  process.env.CLOCHE_MAIL_SINK_DIR = folder;
});

afterAll(async () => {
  for (const n of notifiers) await n.close();
  await sink.close();
  process.env.CLOCHE_SMTP_URL = saved.url;
  process.env.CLOCHE_MAIL_SINK_DIR = saved.dir;
});

/** A notifier on an injected clock that runs only when asked. Control-stopped checks are kept out of the way unless asked for. */
async function notifierFor(siteId: string, clock: { now: Date }, options: Partial<NotifierOptions> = {}) {
  const n = await createNotifier({ logger: quietNotifierLogger, siteIds: [siteId], now: () => clock.now, loop: false, controllerSilentAfterMs: 365 * 24 * 3600_000, baseUrl: "http://127.0.0.1:3000", ...options });
  notifiers.push(n);
  return n;
}

async function inbox(address: string): Promise<MailMessage[]> {
  const mine = (await listMail(folder, { limit: 10_000 })).filter((m) => m.to.includes(address)).reverse();
  return Promise.all(mine.map(async (m) => (await readMail(folder, m.id))!));
}

const subjects = async (address: string) => (await inbox(address)).map((m) => m.subject);

const members = [
  { name: "Olive", role: "owner" as const, unit: "f" as const },
  { name: "Gil", role: "grower" as const, quiet: ["22:00", "07:00"] as [string, string] },
  { name: "Vic", role: "viewer" as const },
];

describe("an alert opening", () => {
  it("sends one e-mail to each member who receives its kind, and no repeats on further passes", async () => {
    const site = await createAlertSite({ members });
    const [olive, gil, vic] = site.members;
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock);
    const frost = await insertAlert(site, { kind: "too_cold", raisedAt: T, message: "Long house is below its frost limit.", detail: { valueC: 1.5, limitC: 2 } });
    const warm = await insertAlert(site, { kind: "too_warm", raisedAt: T, message: "Long house is too warm.", detail: { valueC: 33, limitC: 32 } });

    const first = await n.runOnce();
    expect(first).toMatchObject({ sites: 1, written: 5, sending: { sent: 5, failed: 0 } });
    for (const pass of [1, 2, 3]) {
      clock.now = plusMin(T, pass);
      expect((await n.runOnce())!.written).toBe(0);
    }
    const frostSubject = `Frost risk in Long house — ${site.name}`;
    const warmSubject = `Too warm in Long house — ${site.name}`;
    expect((await subjects(olive!.email)).sort()).toEqual([frostSubject, warmSubject].sort());
    expect((await subjects(gil!.email)).sort()).toEqual([frostSubject, warmSubject].sort());
    // A viewer chooses nothing by default, but frost risk always goes.
    expect(await subjects(vic!.email)).toEqual([frostSubject]);
    // Each in the reader's own unit.
    const oliveFrost = (await inbox(olive!.email)).find((m) => m.subject === frostSubject)!;
    expect(oliveFrost.text).toContain("The reading was 34.7 °F; this alert is for below 35.6 °F.");
    expect(oliveFrost.text).toContain(`http://127.0.0.1:3000/sites/${site.slug}/alerts`);
    expect((await inbox(vic!.email))[0]!.text).toContain("The reading was 1.5 °C");

    const rows = await outboxOf(site.siteId);
    expect(rows.map((r) => [r.alertId, r.purpose, r.status, r.dedupeKey])).toEqual(
      expect.arrayContaining([
        [frost, "alert_raised", "sent", `alert:${frost}:raised:${olive!.userId}`],
        [warm, "alert_raised", "sent", `alert:${warm}:raised:${gil!.userId}`],
      ]),
    );
    expect(rows.every((r) => r.sentAt?.getTime() === T.getTime() && r.attempts === 1 && r.lastError === null)).toBe(true);
    const [notice] = await getDb().select().from(alertNotices).where(eq(alertNotices.alertId, frost));
    expect(notice).toMatchObject({ raisedAt: T, reminders: 0, clearedAt: null });
  });
});

describe("reminders", () => {
  it("go once the house's interval has passed and not before, once each, and stop when acknowledged", async () => {
    const site = await createAlertSite({ members: members.slice(0, 2) });
    const [olive, gil] = site.members;
    // This house reminds every 30 min (the default is 120).
    await getDb().insert(houseAlertRules).values({ houseId: site.houseId, rules: { reminderMin: 30 } as never });
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock);
    const id = await insertAlert(site, { kind: "too_cold", raisedAt: T });
    await n.runOnce();
    clock.now = plusMin(T, 29);
    expect((await n.runOnce())!.written).toBe(0);
    clock.now = plusMin(T, 30);
    expect((await n.runOnce())!.written).toBe(2);
    clock.now = plusMin(T, 31);
    expect((await n.runOnce())!.written).toBe(0);
    clock.now = plusMin(T, 60);
    expect((await n.runOnce())!.written).toBe(2);
    const still = `Still open: Frost risk in Long house — ${site.name}`;
    expect((await subjects(olive!.email)).filter((s) => s === still)).toHaveLength(2);
    expect((await inbox(gil!.email)).at(-1)!.text).toContain("This is reminder 2.");
    expect((await outboxOf(site.siteId, id)).filter((r) => r.purpose === "alert_reminder").map((r) => r.dedupeKey)).toEqual(
      expect.arrayContaining([`alert:${id}:reminder:1:${olive!.userId}`, `alert:${id}:reminder:2:${gil!.userId}`]),
    );

    await getDb().update(alerts).set({ acknowledgedAt: plusMin(T, 61), acknowledgedBy: olive!.userId }).where(eq(alerts.id, id));
    for (const min of [90, 120, 300]) {
      clock.now = plusMin(T, min);
      expect((await n.runOnce())!.written).toBe(0);
    }
    expect((await subjects(olive!.email)).filter((s) => s === still)).toHaveLength(2);
  });

  it("use the default interval for an alert about the whole site", async () => {
    const site = await createAlertSite({ members: members.slice(0, 1) });
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock);
    await insertAlert({ siteId: site.siteId, houseId: null }, { kind: "controller_silent", raisedAt: T, message: "Cloche's controller is not running." });
    await n.runOnce();
    clock.now = plusMin(T, 119);
    expect((await n.runOnce())!.written).toBe(0);
    clock.now = plusMin(T, 120);
    expect((await n.runOnce())!.written).toBe(1);
    expect(await subjects(site.members[0]!.email)).toEqual([`Control stopped — ${site.name}`, `Still open: Control stopped — ${site.name}`]);
  });
});

describe("back to normal", () => {
  it("goes to everyone who got the opening e-mail, once", async () => {
    const site = await createAlertSite({ members });
    const [olive, gil, vic] = site.members;
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock);
    const id = await insertAlert(site, { kind: "too_cold", raisedAt: T, detail: { valueC: 1, limitC: 2 } });
    await n.runOnce();
    await clearAlert(id, plusMin(T, 40), "Long house is back above its frost limit.");
    clock.now = plusMin(T, 41);
    expect((await n.runOnce())!.written).toBe(3);
    clock.now = plusMin(T, 42);
    expect((await n.runOnce())!.written).toBe(0);
    for (const member of [olive!, gil!, vic!]) {
      expect(await subjects(member.email)).toEqual([`Frost risk in Long house — ${site.name}`, `Back to normal: Frost risk in Long house — ${site.name}`]);
    }
    const back = (await inbox(vic!.email))[1]!;
    expect(back.text).toContain("Long house is back above its frost limit.");
    expect(back.text).toContain("back to normal at 12:40 (Europe/London), after 40 min");
    // No reminder for a cleared alert, however long.
    clock.now = plusMin(T, 600);
    expect((await n.runOnce())!.written).toBe(0);
  });
});

describe("quiet hours", () => {
  it("hold a too-warm alert until they end, but never frost risk", async () => {
    const site = await createAlertSite({ members: members.slice(0, 2) });
    const [olive, gil] = site.members;
    const night = at("2031-01-14T23:00:00Z");
    const clock = { now: night };
    const n = await notifierFor(site.siteId, clock);
    const warm = await insertAlert(site, { kind: "too_warm", raisedAt: night });
    const frost = await insertAlert(site, { kind: "too_cold", raisedAt: night });
    await n.runOnce();
    expect(await subjects(olive!.email)).toHaveLength(2);
    // Gil has quiet hours 22:00–07:00: frost at once, too warm held until 07:00.
    expect(await subjects(gil!.email)).toEqual([`Frost risk in Long house — ${site.name}`]);
    const held = (await outboxOf(site.siteId, warm)).find((r) => r.userId === gil!.userId)!;
    expect(held).toMatchObject({ status: "held", dueAt: at("2031-01-15T07:00:00Z"), attempts: 0 });
    expect((await outboxOf(site.siteId, frost)).find((r) => r.userId === gil!.userId)!.status).toBe("sent");

    const warmSubject = `Too warm in Long house — ${site.name}`;
    clock.now = at("2031-01-15T06:59:00Z");
    await n.runOnce();
    // (By now Gil has had frost reminders: frost is never held.)
    expect(await subjects(gil!.email)).not.toContain(warmSubject);
    clock.now = at("2031-01-15T07:00:00Z");
    await n.runOnce();
    expect((await subjects(gil!.email)).filter((s) => s === warmSubject)).toHaveLength(1);
    expect((await inbox(gil!.email)).find((m) => m.subject === warmSubject)!.text).toContain("held back until your quiet hours ended");
  });

  it("skip a reminder that falls in them (frost reminders still go)", async () => {
    const site = await createAlertSite({ members: members.slice(0, 2) });
    const [olive, gil] = site.members;
    const evening = at("2031-01-14T20:30:00Z");
    const clock = { now: evening };
    const n = await notifierFor(site.siteId, clock);
    const warm = await insertAlert(site, { kind: "too_warm", raisedAt: evening });
    const frost = await insertAlert(site, { kind: "too_cold", raisedAt: evening });
    await n.runOnce();
    clock.now = at("2031-01-14T22:30:00Z");
    expect((await n.runOnce())!.written).toBe(3);
    const reminders = (await outboxOf(site.siteId)).filter((r) => r.purpose === "alert_reminder");
    expect(reminders.map((r) => [r.alertId, r.userId]).sort()).toEqual(
      [
        [warm, olive!.userId],
        [frost, olive!.userId],
        [frost, gil!.userId],
      ].sort(),
    );
    // The skipped reminder is not made up when the quiet hours end: the next comes a whole interval on.
    clock.now = at("2031-01-15T00:29:00Z");
    expect((await n.runOnce())!.written).toBe(0);
    clock.now = at("2031-01-15T00:30:00Z");
    expect((await n.runOnce())!.written).toBe(3);
    clock.now = at("2031-01-15T07:00:00Z");
    expect((await n.runOnce())!.written).toBe(4);
    expect((await outboxOf(site.siteId, warm)).filter((r) => r.userId === gil!.userId).map((r) => r.dedupeKey)).toEqual([
      `alert:${warm}:raised:${gil!.userId}`,
      `alert:${warm}:reminder:3:${gil!.userId}`,
    ]);
  });

  it("a held opening whose alert is back to normal is skipped, and the back-to-normal goes when the hold ends", async () => {
    const site = await createAlertSite({ members: members.slice(0, 2) });
    const [olive, gil] = site.members;
    const night = at("2031-01-14T23:00:00Z");
    const clock = { now: night };
    const n = await notifierFor(site.siteId, clock);
    const warm = await insertAlert(site, { kind: "too_warm", raisedAt: night });
    await n.runOnce();
    await clearAlert(warm, at("2031-01-15T01:00:00Z"));
    clock.now = at("2031-01-15T01:00:00Z");
    await n.runOnce();
    expect(await subjects(olive!.email)).toEqual([`Too warm in Long house — ${site.name}`, `Back to normal: Too warm in Long house — ${site.name}`]);
    expect(await subjects(gil!.email)).toEqual([]);
    clock.now = at("2031-01-15T07:00:00Z");
    const pass = await n.runOnce();
    expect(pass!.sending).toMatchObject({ sent: 1, skipped: 1 });
    expect(await subjects(gil!.email)).toEqual([`Back to normal: Too warm in Long house — ${site.name}`]);
    expect((await inbox(gil!.email))[0]!.text).toMatch(/during your quiet hours/);
    const opening = (await outboxOf(site.siteId, warm)).find((r) => r.userId === gil!.userId && r.purpose === "alert_raised")!;
    expect(opening).toMatchObject({ status: "skipped", lastError: SKIPPED_AFTER_QUIET_HOURS, sentAt: null });
  });
});

describe("a mail server that is down", () => {
  it("keeps the e-mails waiting with their attempts and reason, then sends each once when it is back", async () => {
    const site = await createAlertSite({ members });
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock);
    const port = sink.port;
    await sink.close();
    try {
      const id = await insertAlert(site, { kind: "too_cold", raisedAt: T });
      const first = await n.runOnce();
      expect(first).toMatchObject({ written: 3, sending: { sent: 0, failed: 1 } });
      let rows = await outboxOf(site.siteId, id);
      expect(rows.every((r) => r.status === "waiting" && r.sentAt === null)).toBe(true);
      const tried = rows.find((r) => r.attempts === 1)!;
      expect(tried.lastError).toBe("The mail server could not be reached (it refused the connection). Trying again in 30 s.");
      expect(tried.dueAt).toEqual(new Date(T.getTime() + 30_000));
      expect(tried.lastTriedAt).toEqual(T);

      // Not tried again before its back-off; the others are, one failure per pass.
      clock.now = new Date(T.getTime() + 10_000);
      await n.runOnce();
      clock.now = new Date(T.getTime() + 40_000);
      await n.runOnce();
      await n.runOnce();
      rows = await outboxOf(site.siteId, id);
      expect(rows.find((r) => r.id === tried.id)!.attempts).toBe(2);
      expect(rows.find((r) => r.id === tried.id)!.dueAt).toEqual(new Date(T.getTime() + 40_000 + 60_000));
      expect(rows.every((r) => r.attempts >= 1 && r.status === "waiting")).toBe(true);
    } finally {
      sink = await startMailSink({ port, folder });
    }
    clock.now = new Date(T.getTime() + 3 * 60_000);
    const back = await n.runOnce();
    expect(back!.sending).toMatchObject({ sent: 3, failed: 0 });
    clock.now = new Date(T.getTime() + 20 * 60_000);
    await n.runOnce();
    for (const member of site.members) expect(await subjects(member.email)).toEqual([`Frost risk in Long house — ${site.name}`]);
    const rows = await outboxOf(site.siteId);
    expect(rows.every((r) => r.status === "sent" && r.sentAt !== null && r.lastError === null)).toBe(true);
  });

  it("gives up a day after the e-mail was written", async () => {
    const site = await createAlertSite({ members: members.slice(0, 1) });
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock, { send: async () => Promise.reject(new Error("refused")) });
    const id = await insertAlert(site, { kind: "too_cold", raisedAt: T });
    await n.runOnce();
    clock.now = new Date(T.getTime() + 24 * 3600_000);
    await n.runOnce();
    const [row] = await outboxOf(site.siteId, id);
    expect(row).toMatchObject({ status: "given_up", attempts: 2, sentAt: null });
    clock.now = new Date(T.getTime() + 48 * 3600_000);
    await n.runOnce();
    const [after] = await outboxOf(site.siteId, id);
    expect(after).toMatchObject({ status: "given_up", attempts: 2, lastError: "The e-mail could not be sent. Given up after a day of tries." });
  });
});

describe("two notifiers at once", () => {
  it("send each e-mail once", async () => {
    const site = await createAlertSite({ members });
    const clock = { now: T };
    const a = await notifierFor(site.siteId, clock);
    const b = await notifierFor(site.siteId, clock);
    const id = await insertAlert(site, { kind: "too_cold", raisedAt: T });
    for (let i = 0; i < 4; i++) await Promise.all([a.runOnce(), b.runOnce(), a.runOnce(), b.runOnce()]);
    await clearAlert(id, plusMin(T, 5));
    clock.now = plusMin(T, 5);
    for (let i = 0; i < 4; i++) await Promise.all([a.runOnce(), b.runOnce()]);
    for (const member of site.members) {
      expect(await subjects(member.email)).toEqual([`Frost risk in Long house — ${site.name}`, `Back to normal: Frost risk in Long house — ${site.name}`]);
    }
  });

  it("a notifier whose lock is taken elsewhere does nothing", async () => {
    const site = await createAlertSite({ members: members.slice(0, 1) });
    const n = await notifierFor(site.siteId, { now: T });
    await insertAlert(site, { kind: "too_cold", raisedAt: T });
    const other = await getPool().getConnection();
    try {
      await other.query("SELECT GET_LOCK(?, 0)", [NOTIFIER_LOCK]);
      expect(await n.runOnce()).toBeNull();
      expect(await outboxOf(site.siteId)).toHaveLength(0);
    } finally {
      await other.query("SELECT RELEASE_LOCK(?)", [NOTIFIER_LOCK]);
      other.release();
    }
    expect((await n.runOnce())!.written).toBe(1);
  });

  it("a claimed e-mail cannot be claimed again", async () => {
    const site = await createAlertSite({ members: members.slice(0, 1) });
    const n = await notifierFor(site.siteId, { now: T }, { send: async () => Promise.reject(new Error("down")) });
    await insertAlert(site, { kind: "too_cold", raisedAt: T });
    await n.runOnce();
    const [row] = await outboxOf(site.siteId);
    const now = new Date(T.getTime() + 60_000);
    const claims = await Promise.all([1, 2, 3].map(() => claimMail({ id: row!.id, now, leaseUntil: new Date(now.getTime() + 300_000) })));
    expect(claims.filter(Boolean)).toHaveLength(1);
  });
});

describe("control stopped", () => {
  it("is raised when the heartbeat stops, once, and cleared when it comes back", async () => {
    const site = await createAlertSite({ members });
    const [olive, gil, vic] = site.members;
    const instanceId = `test-${site.slug}`;
    await getDb().insert(controllerHeartbeats).values({ instanceId, host: "test", pid: 1, sites: site.slug, startedAt: T, beatAt: T });
    const clock = { now: T };
    const n = await notifierFor(site.siteId, clock, { controllerSilentAfterMs: 60_000 });
    const openAlerts = () => getDb().select().from(alerts).where(sql`${alerts.siteId} = ${site.siteId} AND ${alerts.kind} = 'controller_silent'`);
    try {
      clock.now = new Date(T.getTime() + 30_000);
      expect((await n.runOnce())!.controlStopped).toEqual({ raised: 0, cleared: 0 });
      clock.now = new Date(T.getTime() + 61_000);
      expect((await n.runOnce())!.controlStopped).toEqual({ raised: 1, cleared: 0 });
      clock.now = new Date(T.getTime() + 120_000);
      expect((await n.runOnce())!.controlStopped).toEqual({ raised: 0, cleared: 0 });
      let rows = await openAlerts();
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({ houseId: null, clearedAt: null, raisedAt: new Date(T.getTime() + 61_000) });
      expect(await subjects(olive!.email)).toEqual([`Control stopped — ${site.name}`]);
      expect(await subjects(gil!.email)).toEqual([`Control stopped — ${site.name}`]);
      expect(await subjects(vic!.email)).toEqual([]);

      // The controller beats again.
      await getDb().update(controllerHeartbeats).set({ beatAt: new Date(T.getTime() + 200_000) }).where(eq(controllerHeartbeats.instanceId, instanceId));
      clock.now = new Date(T.getTime() + 205_000);
      expect((await n.runOnce())!.controlStopped).toEqual({ raised: 0, cleared: 1 });
      clock.now = new Date(T.getTime() + 206_000);
      await n.runOnce();
      rows = await openAlerts();
      expect(rows[0]!.clearedAt).toEqual(new Date(T.getTime() + 205_000));
      expect(rows[0]!.clearedMessage).toBe("The controller is running again (heard at 12:03); plugs follow their schedules.");
      expect(await subjects(olive!.email)).toEqual([`Control stopped — ${site.name}`, `Back to normal: Control stopped — ${site.name}`]);

      // A clean stop is given the same grace before it counts.
      await getDb().update(controllerHeartbeats).set({ stoppedAt: new Date(T.getTime() + 300_000), beatAt: new Date(T.getTime() + 300_000) }).where(eq(controllerHeartbeats.instanceId, instanceId));
      clock.now = new Date(T.getTime() + 330_000);
      expect((await n.runOnce())!.controlStopped.raised).toBe(0);
      clock.now = new Date(T.getTime() + 361_000);
      expect((await n.runOnce())!.controlStopped.raised).toBe(1);
      expect(await openAlerts()).toHaveLength(2);
    } finally {
      await getDb().delete(controllerHeartbeats).where(eq(controllerHeartbeats.instanceId, instanceId));
    }
  });
});

describe("the loop", () => {
  it("runs passes on its own timer, and close() stops it and can be called twice", async () => {
    const site = await createAlertSite({ members: members.slice(0, 1) });
    await insertAlert(site, { kind: "too_cold", raisedAt: new Date() });
    const n = await createNotifier({ logger: quietNotifierLogger, siteIds: [site.siteId], everyMs: 1000, controllerSilentAfterMs: 365 * 24 * 3600_000 });
    const deadline = Date.now() + 5000;
    while ((await outboxOf(site.siteId)).filter((r) => r.status === "sent").length === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    await Promise.all([n.close(), n.close()]);
    expect((await outboxOf(site.siteId)).map((r) => r.status)).toEqual(["sent"]);
    const count = (await getDb().select({ n: sql<number>`COUNT(*)`.mapWith(Number) }).from(outboundMail))[0]!.n;
    await new Promise((r) => setTimeout(r, 1200));
    expect((await getDb().select({ n: sql<number>`COUNT(*)`.mapWith(Number) }).from(outboundMail))[0]!.n).toBe(count);
  });

  it("refuses options that make no sense", async () => {
    await expect(createNotifier({ logger: quietNotifierLogger, everyMs: 0, loop: false })).rejects.toThrow(/everyMs/);
  });
});
