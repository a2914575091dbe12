// The owner reads a week's runtime, energy and cost, and takes the spreadsheet and
// the printable report; a helper reads the same page without the exports.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MEMBERS, DEMO_SITE } from "@/db/seed";
import { expectAccessible, newPage, openBrowser, screenshot, screenshotOnFailure, signIn, type Browser } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const member = (role: string) => DEMO_MEMBERS.find((m) => m.role === role)!;

describe("the reports", () => {
  it("show the owner a week of runtime and cost, with the exports", async () => {
    const page = await newPage(browser, "desk");
    screenshotOnFailure(page, "reports-owner");
    await signIn(page, member("owner").email, member("owner").password);
    await page.getByRole("link", { name: "Reports", exact: true }).click();
    await page.waitForURL(/\/reports$/);
    await page.getByRole("link", { name: "Last 7 days" }).click();
    await page.waitForURL(/\/reports\?from=\d{4}-\d{2}-\d{2}&to=/);
    await expect.poll(() => page.getByRole("heading", { name: "Runtime by day" }).count()).toBe(1);
    // The demo history's heaters ran, and the demo tariff costs them.
    const runtime = await page.getByText(/^\d[\d,]*\.\d h$/).first().textContent();
    expect(Number(runtime!.replace(/[^\d.]/g, ""))).toBeGreaterThan(0);
    expect(await page.getByRole("img", { name: /^Runtime by day/ }).count()).toBe(1);
    await expectAccessible(page, "the reports page");
    await screenshot(page, "reports-owner");

    const csv = page.getByRole("link", { name: "Spreadsheet (CSV)" });
    const pdf = page.getByRole("link", { name: "Printable report (PDF)" });
    const fetched = await page.evaluate(async (urls) => Promise.all(urls.map(async (u) => {
      const r = await fetch(u!);
      return [r.status, r.headers.get("content-type"), (await r.text()).slice(0, 60)];
    })), [await csv.getAttribute("href"), await pdf.getAttribute("href")]);
    expect(fetched[0]![0]).toBe(200);
    expect(fetched[0]![2]).toMatch(/^period_from,period_to,row,house,plug,runtime_h/);
    expect(fetched[1]![1]).toBe("application/pdf");
    await page.close();
  });

  it("show a helper the same figures on a phone, without the exports", async () => {
    const page = await newPage(browser, "phone");
    screenshotOnFailure(page, "reports-helper");
    await signIn(page, member("helper").email, member("helper").password);
    await page.goto(`/sites/${DEMO_SITE.slug}/reports`);
    await expect.poll(() => page.getByRole("heading", { name: "Runtime, energy and cost" }).count()).toBe(1);
    expect(await page.getByRole("link", { name: "Spreadsheet (CSV)" }).count()).toBe(0);
    await screenshot(page, "reports-helper");
    await page.close();
  });
});
