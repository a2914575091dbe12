// A helper, on a phone, overrides the glasshouse heater from the houses page and sees
// the press confirmed by the plug's own report (the simulated plug, through the real
// controller and broker).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MEMBERS } from "@/db/seed";
import { expectAccessible, screenshotOnFailure, newPage, openBrowser, screenshot, signIn, type Browser } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const helper = DEMO_MEMBERS.find((m) => m.role === "helper")!;
// The heater may have to wait out its minimum on/off time (3 minutes in the demo) first.
const GUARD_WAIT_MS = 200_000;

describe("the helper's override", () => {
  it(
    "switches the heater the other way for an hour and shows it confirmed",
    async () => {
      const page = await newPage(browser, "phone");
      screenshotOnFailure(page, "helper-override");
      await signIn(page, helper.email, helper.password);
      await page.getByRole("link", { name: /^Switch for a while\s*: Glasshouse heater$/ }).click();
      await page.waitForURL(/\/plugs\/[0-9a-f-]{36}\/override$/);
      const now = page.getByRole("region", { name: "Now" });
      await expect.poll(() => now.getByText(/^(On|Off)$/).count()).toBe(1);
      const wasOn = (await now.getByText(/^(On|Off)$/).textContent()) === "On";
      await screenshot(page, "helper-override-before");
      await expectAccessible(page, "the override page");

      await page.getByRole("radio", { name: "1 hour" }).check();
      await page.getByLabel("Reason (optional)").fill("Checking the heater after the storm");
      await page.getByRole("button", { name: wasOn ? "Switch off" : "Switch on" }).click();

      const state = page.locator("[data-confirmation]");
      await expect.poll(() => state.count()).toBe(1);
      await expect.poll(() => state.getAttribute("data-confirmation"), { timeout: GUARD_WAIT_MS, interval: 500 }).toBe("confirmed");
      await expect.poll(() => now.getByText(wasOn ? "Off" : "On", { exact: true }).count()).toBe(1);
      await expect.poll(() => page.getByText("Checking the heater after the storm").count()).toBeGreaterThan(0);
      await screenshot(page, "helper-override-confirmed");

      // Anyone allowed may cancel it; the schedule takes over again.
      await page.getByRole("button", { name: "Cancel override — back to the schedule" }).click();
      await expect.poll(() => page.locator("[data-confirmation]").count()).toBe(0);
      await page.close();
    },
    GUARD_WAIT_MS + 60_000,
  );
});
