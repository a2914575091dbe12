// Each role signs in and opens every section its navigation offers, at a phone's and a
// desk's width: each page renders without an error page, is screenshotted, and has no
// serious or critical accessibility violations.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MEMBERS } from "@/db/seed";
import { expectAccessible, screenshotOnFailure, newPage, openBrowser, screenshot, signIn, type Browser, type Width } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe.each(DEMO_MEMBERS)("the $role's sections", (member) => {
  it.each(["phone", "desk"] as Width[])("open cleanly at %s width", async (width) => {
    const page = await newPage(browser, width);
    screenshotOnFailure(page, `tour-${member.role}`);
    await signIn(page, member.email, member.password);
    const nav = page.getByRole("navigation", { name: "Site sections" });
    const links = await nav.getByRole("link").evaluateAll((as) => as.map((a) => ({ href: a.getAttribute("href")!, label: a.textContent!.trim() })));
    expect(links.length).toBeGreaterThan(0);
    for (const link of links) {
      const response = await page.goto(link.href);
      expect(response?.status(), `${link.label} (${link.href}) for the ${member.role}`).toBe(200);
      await expect.poll(() => page.getByRole("heading", { level: 1 }).count()).toBeGreaterThan(0);
      await screenshot(page, `${member.role}-${link.label.toLowerCase()}`);
      await expectAccessible(page, `${link.label} for the ${member.role}`);
    }
    await page.close();
  });
});
