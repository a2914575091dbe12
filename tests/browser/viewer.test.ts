// The viewer sees the site but can change nothing: no controls on the pages, and the
// API refuses a write sent from the signed-in browser.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MEMBERS, DEMO_SITE, demoId } from "@/db/seed";
import { screenshotOnFailure, newPage, openBrowser, screenshot, signIn, type Browser } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const viewer = DEMO_MEMBERS.find((m) => m.role === "viewer")!;
const heater = demoId("plug:glass-heater");

describe("the viewer", () => {
  it("cannot edit anything", async () => {
    const page = await newPage(browser, "phone");
    screenshotOnFailure(page, "viewer");
    await signIn(page, viewer.email, viewer.password);
    const base = new URL(page.url()).pathname;
    await expect.poll(() => page.getByText("Glasshouse heater").count()).toBeGreaterThan(0);
    for (const name of [/^Switch for a while/, /^Schedule of/, "Add a house", "House settings"]) {
      expect(await page.getByRole("link", { name }).count(), `houses page link ${name}`).toBe(0);
    }

    await page.goto(`${base}/plugs/${heater}/override`);
    await expect.poll(() => page.getByRole("region", { name: "Now" }).count()).toBe(1);
    expect(await page.getByRole("button", { name: /^Switch (on|off)$/ }).count()).toBe(0);
    await screenshot(page, "viewer-override");

    await page.goto(`${base}/plugs/${heater}/schedule`);
    await expect.poll(() => page.getByRole("list", { name: "Time windows by day" }).count()).toBe(1);
    expect(await page.getByRole("button", { name: "Save plan" }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /^Add a window/ }).count()).toBe(0);
    await screenshot(page, "viewer-schedule");

    await page.goto(`${base}/devices`);
    expect(await page.getByRole("link", { name: "Add a plug" }).count()).toBe(0);
    await page.goto(`${base}/settings`);
    expect(await page.getByRole("button", { name: "Save site settings" }).count()).toBe(0);
    // Their own °C/°F stays theirs to choose.
    expect(await page.getByRole("button", { name: "Save my settings" }).count()).toBe(1);

    const status = await page.evaluate(async ({ siteId, plugId }) => {
      const response = await fetch(`/api/sites/${siteId}/plugs/${plugId}/overrides`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ on: true, duration: "30m" }),
      });
      return response.status;
    }, { siteId: DEMO_SITE.id, plugId: heater });
    expect(status).toBe(403);
    await page.close();
  });
});
