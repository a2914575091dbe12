// Alerts as people meet them: a helper on a phone sees an open frost alert, acknowledges
// it and sets quiet hours for their own e-mails (frost stays locked on); the grower
// changes a house's too-warm rule at a desk.
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb, getPool } from "@/db/client";
import { DEMO_MEMBERS, DEMO_SITE } from "@/db/seed";
import { alerts, houseAlertRules, houses } from "@/db/schema";
import { expectAccessible, newPage, openBrowser, screenshot, screenshotOnFailure, signIn, type Browser } from "./support";

let browser: Browser;
let alertId: number;
let houseId: string;
let houseName: string;

beforeAll(async () => {
  browser = await openBrowser();
  const [house] = await getDb().select({ id: houses.id, name: houses.name }).from(houses).where(eq(houses.siteId, DEMO_SITE.id)).limit(1);
  houseId = house!.id;
  houseName = house!.name;
  // An alert as the controller writes one, so the journey does not wait for a real frost.
  const [row] = await getDb()
    .insert(alerts)
    .values({
      siteId: DEMO_SITE.id,
      houseId,
      kind: "too_cold",
      message: `Frost risk in ${houseName}: the bench sensor is at or below the frost alert temperature.`,
      detail: { valueC: 1.4, limitC: 2, hysteresisK: 0.5, lastedMin: 2, houseName, sensorName: `journey-${randomUUID().slice(0, 4)}` },
      raisedAt: new Date(Date.now() - 5 * 60_000),
    })
    .$returningId();
  alertId = row!.id;
});

afterAll(async () => {
  await browser?.close();
  await getDb().delete(alerts).where(eq(alerts.id, alertId));
  await getDb().delete(houseAlertRules).where(eq(houseAlertRules.houseId, houseId));
  await getPool().end();
});

const member = (role: string) => DEMO_MEMBERS.find((m) => m.role === role)!;

describe("alerts", () => {
  it("let a helper on a phone acknowledge an open frost alert and set quiet hours, frost staying on", async () => {
    const page = await newPage(browser, "phone");
    screenshotOnFailure(page, "alerts-helper");
    await signIn(page, member("helper").email, member("helper").password);
    await page.getByRole("link", { name: "Alerts", exact: true }).click();
    await page.waitForURL(/\/alerts$/);
    const card = page.locator("li").filter({ has: page.getByRole("heading", { name: "Frost risk", level: 3 }) }).first();
    await expect.poll(() => card.count()).toBe(1);
    await expectAccessible(page, "the alerts page");
    await screenshot(page, "alerts-helper-list");
    await card.getByRole("button", { name: /Acknowledge/ }).click();
    await expect.poll(() => card.getByText(/Acknowledged by Tam Oduya/).count()).toBe(1);
    const [stored] = await getDb().select({ by: alerts.acknowledgedBy }).from(alerts).where(eq(alerts.id, alertId));
    expect(stored!.by).not.toBeNull();

    await page.getByRole("link", { name: "My e-mails" }).click();
    await page.waitForURL(/\/alerts\/mine$/);
    const frost = page.getByRole("checkbox", { name: /Frost risk/ });
    expect(await frost.isChecked()).toBe(true);
    expect(await frost.isDisabled()).toBe(true);
    await page.getByLabel("From", { exact: true }).fill("22:00");
    await page.getByLabel("Until", { exact: true }).fill("06:30");
    await page.getByRole("button", { name: "Save my alert e-mails" }).click();
    await expect.poll(() => page.getByText(/^Saved\./).count()).toBe(1);
    await expectAccessible(page, "my alert e-mails");
    await screenshot(page, "alerts-helper-mine");
    await page.close();
  });

  it("let the grower raise a house's too-warm temperature, stored in °C", async () => {
    const page = await newPage(browser, "desk");
    screenshotOnFailure(page, "alerts-grower-rules");
    await signIn(page, member("grower").email, member("grower").password);
    await page.goto(`/sites/${DEMO_SITE.slug}/alerts/settings`);
    const panel = page.getByRole("region", { name: houseName });
    // On a desk the panels may open folded: open this one.
    const fold = panel.locator("details").first();
    if ((await fold.getAttribute("open")) === null) await fold.locator("summary").first().click();
    await expectAccessible(page, "the alert rules page");
    await panel.getByLabel("Too warm above").fill("30");
    await panel.getByRole("button", { name: /^Save rules for/ }).click();
    await expect.poll(async () => {
      const [row] = await getDb().select({ rules: houseAlertRules.rules }).from(houseAlertRules).where(eq(houseAlertRules.houseId, houseId));
      return row?.rules.tooWarm.aboveC;
    }).toBe(30);
    await expect.poll(() => panel.getByText(/^Saved\./).count()).toBe(1);
    await screenshot(page, "alerts-grower-rules");
    await page.close();
  });
});
