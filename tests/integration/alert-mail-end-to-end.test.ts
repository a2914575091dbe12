// From a reading to an e-mail: a simulated sensor publishes through the real broker,
// the controller's rules open and close alerts in MariaDB, and the web app's notifier
// sends them through a real SMTP sink. The controller and the notifier share the
// test's clock, so minutes pass at once.
import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { and, asc, eq } from "drizzle-orm";
import type { MqttClient } from "mqtt";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { alerts, houseAlertRules, memberships, user } from "@/db/schema";
import { createController, type Controller } from "@/controller/controller";
import { startMailSink, type MailSink } from "@/fakes/mail-sink";
import { DEFAULT_ALERT_RULES, type AlertRules } from "@/lib/alerts/rules";
import { deviceUsername } from "@/lib/mqtt/credentials";
import { sensorTopic } from "@/lib/mqtt/topics";
import { createNotifier, type Notifier } from "@/lib/server/alerts/notifier";
import { listMail, readMail } from "@/lib/server/mailbox";
import { quietNotifierLogger } from "../support/alert-site";
import { connectAs, createControlSite, eventually, testControllerOptions, type ControlSite } from "../support/control-site";

const MIN = 60_000;
// A winter night far from the real clock; London is on GMT then.
let clock = Date.parse("2031-01-20T02:00:00Z");
let site: ControlSite;
let controller: Controller;
let notifier: Notifier;
let sensor: MqttClient;
let sink: MailSink;
let folder: string;
let ownerEmail: string;
const saved = { url: process.env.CLOCHE_SMTP_URL, dir: process.env.CLOCHE_MAIL_SINK_DIR };

// The house's frost limit is the houses table's default, 2 °C; reminders every 15 min.
const rules: AlertRules = {
  ...DEFAULT_ALERT_RULES,
  frost: { belowC: null, holdMin: 2 },
  hysteresisK: 0.5,
  sensorSilent: { enabled: true, afterMin: 10 },
  reminderMin: 15,
  condensation: { ...DEFAULT_ALERT_RULES.condensation, enabled: false },
  plugOffline: { ...DEFAULT_ALERT_RULES.plugOffline, enabled: false },
  plugMismatch: { ...DEFAULT_ALERT_RULES.plugMismatch, enabled: false },
  heaterLongOn: { ...DEFAULT_ALERT_RULES.heaterLongOn, enabled: false },
};

async function send(minutes: number, tempC: number) {
  clock += minutes * MIN;
  await sensor.publishAsync(sensorTopic(site.slug, "air-1"), JSON.stringify({ temp_c: tempC, rh: 60, battery: 0.9, at: new Date(clock).toISOString() }), { qos: 1 });
}

async function openRows(kind: (typeof alerts.$inferSelect)["kind"]) {
  return getDb()
    .select()
    .from(alerts)
    .where(and(eq(alerts.siteId, site.siteId), eq(alerts.kind, kind)))
    .orderBy(asc(alerts.id));
}

/** The owner's e-mails, oldest first. */
async function mailToOwner() {
  return (await listMail(folder, { limit: 1000 })).filter((m) => m.to.includes(ownerEmail)).reverse();
}

async function subjects(): Promise<string[]> {
  return (await mailToOwner()).map((m) => m.subject);
}

beforeAll(async () => {
  folder = mkdtempSync(path.join(os.tmpdir(), "cloche-alert-e2e-"));
  sink = await startMailSink({ port: 0, folder });
  process.env.CLOCHE_SMTP_URL = sink.url;
  process.env.CLOCHE_MAIL_SINK_DIR = folder;

  // The plugs judge the sensor stale only after an hour: the silence here is the rule's.
  site = await createControlSite(getDb(), { staleAfterS: 3600 });
  await getDb().insert(houseAlertRules).values({ houseId: site.houseId, rules });
  const ownerId = randomUUID();
  ownerEmail = `owner-${site.slug}@test.example`;
  await getDb().insert(user).values({ id: ownerId, name: "Ivy Tremlett", email: ownerEmail, emailVerified: true });
  await getDb().insert(memberships).values({ id: randomUUID(), siteId: site.siteId, userId: ownerId, role: "owner" });

  // The site's plugs have no devices here: they would raise "not answering", which is not this test's subject.
  controller = await createController(testControllerOptions(site, { now: () => clock, unansweredAfter: 1_000_000 }));
  sensor = await connectAs(controller.mqttUrl, deviceUsername(site.slug, "sensor", "air-1"), site.secret("sensor", "air-1"));
  notifier = await createNotifier({
    logger: quietNotifierLogger,
    siteIds: [site.siteId],
    now: () => new Date(clock),
    loop: false,
    // The controller's heartbeats are on the real clock; "control stopped" is tested on its own.
    controllerSilentAfterMs: 365 * 24 * 3600_000,
    baseUrl: "http://127.0.0.1:3000",
  });
});

afterAll(async () => {
  await notifier?.close();
  await sensor?.endAsync();
  await controller?.close();
  await sink?.close();
  process.env.CLOCHE_SMTP_URL = saved.url;
  process.env.CLOCHE_MAIL_SINK_DIR = saved.dir;
});

describe("alert e-mails from live readings", () => {
  it("a house cooling below its frost limit sends exactly one e-mail, a reminder after the interval, and a back-to-normal when it recovers", async () => {
    const frost = `Frost risk in Test house — Control test ${site.slug}`;
    await send(0, 3.2);
    await send(1, 1.8);
    await send(1, 1.6);
    await send(1, 1.4); // two minutes at or below 2 °C
    await eventually(async () => (await openRows("too_cold")).length === 1 || undefined, 5000, "frost risk raised");
    await notifier.runOnce();
    expect(await subjects()).toEqual([frost]);

    // Still cold: more readings and passes within the interval send nothing more.
    for (const t of [1.2, 1.0, 1.1]) {
      await send(3, t);
      await notifier.runOnce();
    }
    expect(await subjects()).toEqual([frost]);
    expect(await openRows("too_cold")).toHaveLength(1);

    // The interval passes without anyone acknowledging: one reminder.
    await send(7, 1.0);
    await notifier.runOnce();
    await notifier.runOnce();
    const afterReminder = await subjects();
    expect(afterReminder).toHaveLength(2);
    expect(afterReminder[1]).toBe(`Still open: ${frost}`);

    // Recovers past the limit and its 0.5 K hysteresis.
    await send(2, 2.4);
    await send(1, 2.6);
    await eventually(async () => (await openRows("too_cold"))[0]?.clearedAt ?? undefined, 5000, "frost risk cleared");
    await notifier.runOnce();
    await notifier.runOnce();
    const all = await subjects();
    expect(all, all.join(" / ")).toHaveLength(3);
    expect(all[2]).toBe(`Back to normal: Frost risk in Test house — Control test ${site.slug}`);
    const back = (await mailToOwner())[2]!;
    const body = (await readMail(folder, back.id))!.text;
    expect(body).toContain("Test house");
  });

  it("a sensor that goes silent raises its alert after the rule's limit, and its e-mail goes out", async () => {
    const before = (await subjects()).length;
    await send(0, 6.0);
    clock += 9 * MIN;
    await new Promise((resolve) => setTimeout(resolve, 6000)); // a few of the controller's alert passes
    expect(await openRows("sensor_quiet")).toEqual([]);
    clock += 2 * MIN; // past 10 min without a reading
    const [silent] = await eventually(async () => {
      const rows = await openRows("sensor_quiet");
      return rows.length ? rows : undefined;
    }, 10_000, "sensor silent raised");
    expect(silent).toMatchObject({ sensorId: site.sensorId, houseId: site.houseId, clearedAt: null });
    await notifier.runOnce();
    const now = await subjects();
    expect(now, now.join(" / ")).toHaveLength(before + 1);
    expect(now[before]).toMatch(/^Sensor silent/);
  });
});
