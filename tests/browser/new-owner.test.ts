// A new owner signs up, is led from "No houses yet" to a house with a heater plug and a
// sensor, and sees them on the overview.
import { randomUUID } from "node:crypto";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { expectAccessible, screenshotOnFailure, newPage, openBrowser, screenshot, type Browser } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** Fills a form once its page is interactive (a value typed before hydration would be reset). */
async function fill(page: Page, values: Record<string, string>) {
  await page.waitForLoadState("networkidle");
  for (const [label, value] of Object.entries(values)) await page.getByLabel(label, { exact: true }).fill(value);
}

describe("a new owner", () => {
  it("signs up, adds a house with a heater plug and a sensor, and sees it on the overview", async () => {
    const page = await newPage(browser, "phone");
    screenshotOnFailure(page, "new-owner");
    await page.context().clearCookies();
    await page.goto("/sign-up");
    await fill(page, {
      Name: "Rhea Quillon",
      Email: `rhea-${randomUUID().slice(0, 8)}@quillon.example`,
      Password: "a-long-enough-password",
      "Site name": "Quillon Allotment",
    });
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL(/\/sites\/[a-z0-9-]+$/);
    await expect.poll(() => page.getByText("No houses yet").count()).toBe(1);
    await screenshot(page, "new-owner-empty");
    await expectAccessible(page, "an empty site");

    await page.getByRole("link", { name: "Add a house" }).click();
    await page.waitForURL(/\/houses\/new$/);
    await fill(page, { Name: "Plot glasshouse", "Length (m)": "4", "Width (m)": "2.5", "Eave height (m)": "1.8", "Ridge height (m)": "2.4" });
    await page.getByRole("button", { name: "Add the house" }).click();
    await page.waitForURL(/\/houses\/[0-9a-f-]{36}/);
    const housePage = new URL(page.url()).pathname;
    await screenshot(page, "new-owner-house-added");

    await page.getByRole("link", { name: "Add a plug" }).first().click();
    await page.waitForURL(/\/devices\/plugs\/new/);
    await fill(page, { Name: "Plot heater", "Device id": "plot-heater", "Rated power (W)": "2000", "Plug rating (A)": "13" });
    await page.getByRole("button", { name: "Add the plug" }).click();
    await page.waitForURL(/\/devices\/plug\/[0-9a-f-]{36}/);
    await screenshot(page, "new-owner-plug-added");

    await page.goto(housePage);
    await page.getByRole("link", { name: "Add a sensor" }).first().click();
    await page.waitForURL(/\/devices\/sensors\/new/);
    await fill(page, { Name: "Plot air", "Device id": "plot-air" });
    await page.getByRole("button", { name: "Add the sensor" }).click();
    await page.waitForURL(/\/devices\/sensor\/[0-9a-f-]{36}/);

    await page.getByRole("navigation", { name: "Site sections" }).getByRole("link", { name: "Houses" }).click();
    await expect.poll(() => page.getByText("Plot glasshouse").count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByText("Plot heater").count()).toBeGreaterThan(0);
    await screenshot(page, "new-owner-overview");
    await page.close();
  });
});
