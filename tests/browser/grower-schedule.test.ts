// The grower opens the glasshouse heater's week, changes a window's band with the
// keyboard and the window form, sees the preview follow before saving, and saves.
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

const grower = DEMO_MEMBERS.find((m) => m.role === "grower")!;

describe("the grower's schedule", () => {
  it("edits a window and sees the preview change, then saves it", async () => {
    const page = await newPage(browser, "desk");
    screenshotOnFailure(page, "grower-schedule");
    await signIn(page, grower.email, grower.password);
    await page.getByRole("link", { name: "Schedule of Glasshouse heater" }).click();
    await page.waitForURL(/\/plugs\/[0-9a-f-]{36}\/schedule$/);
    const preview = page.getByRole("list", { name: "Preview, change by change" });
    // The demo's day window: 8–10 °C.
    await expect.poll(() => preview.getByText("8–10 °C", { exact: true }).count()).toBeGreaterThan(0);
    expect(await preview.getByText("6–9 °C", { exact: true }).count()).toBe(0);
    await expectAccessible(page, "the schedule editor");

    const window = page.locator("[data-window='0'][data-opens]").first();
    await window.focus();
    await page.keyboard.press("Enter");
    await page.getByLabel("Low edge (°C)", { exact: true }).fill("6");
    await page.getByLabel("High edge (°C)", { exact: true }).fill("9");
    await page.getByRole("button", { name: "Keep this window" }).click();

    // The preview follows the draft before anything is saved.
    await expect.poll(() => preview.getByText("6–9 °C", { exact: true }).count()).toBeGreaterThan(0);
    expect(await preview.getByText("8–10 °C", { exact: true }).count()).toBe(0);
    await expect.poll(() => page.getByText("Unsaved changes").count()).toBe(1);
    await screenshot(page, "grower-schedule-draft");

    await page.getByRole("button", { name: "Save plan" }).click();
    await expect.poll(() => page.getByText(/^Saved\./).count()).toBe(1);
    await page.reload();
    await expect.poll(() => preview.getByText("6–9 °C", { exact: true }).count()).toBeGreaterThan(0);

    const phone = await newPage(browser, "phone");
    await phone.goto(page.url());
    await expect.poll(() => phone.getByRole("list", { name: "Time windows by day" }).count()).toBe(1);
    await screenshot(phone, "grower-schedule");
    await phone.close();
    await page.close();
  });
});
