// What every browser journey needs: Debian's Chromium driven by playwright-core, a
// page at a phone's or a desk's width, signing in, screenshots kept as test artefacts,
// and an axe-core check that fails on serious or critical violations.
import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { expect, onTestFailed } from "vitest";

export const CHROMIUM = "/usr/bin/chromium";
export const SCREENSHOTS = path.resolve("test-results/screenshots");

/** The two widths every journey is looked at: a phone and a desk. */
export const WIDTHS = { phone: 390, desk: 1280 } as const;
export type Width = keyof typeof WIDTHS;

export function baseUrl(): string {
  const url = process.env.CLOCHE_BROWSER_BASE_URL;
  if (!url) throw new Error("Browser journeys need CLOCHE_BROWSER_BASE_URL: run them with `npm test`, which starts the stack.");
  return url;
}

export type Browser = { context: BrowserContext; close: () => Promise<void> };

/** One browser with its own profile, thrown away on close. */
export async function openBrowser(): Promise<Browser> {
  const profile = mkdtempSync(path.join(os.tmpdir(), "cloche-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
    baseURL: baseUrl(),
    viewport: { width: WIDTHS.desk, height: 900 },
  });
  context.setDefaultTimeout(15_000);
  return {
    context,
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** A fresh page (own cookies: a new incognito-like context is not possible with a persistent profile, so sign out between people). */
export async function newPage(browser: Browser, width: Width): Promise<Page> {
  const page = await browser.context.newPage();
  await page.setViewportSize({ width: WIDTHS[width], height: width === "phone" ? 844 : 900 });
  return page;
}

export async function signIn(page: Page, email: string, password: string) {
  await page.context().clearCookies();
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/sites\//);
}

/** Saves a full-page screenshot as test-results/screenshots/<name>-<width>.png. */
export async function screenshot(page: Page, name: string) {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const width = page.viewportSize()?.width ?? 0;
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}-${width}.png`), fullPage: true });
}

/** No serious or critical accessibility violations (axe-core, WCAG 2 A/AA rules). */
export async function expectAccessible(page: Page, what: string) {
  // Next streams a dynamic page's <title> after its body, and again after a refresh:
  // check the page once it has one, as a person's browser shows it.
  await expect.poll(() => page.title(), { timeout: 10_000 }).not.toBe("");
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  const bad = results.violations.filter((v) => v.impact === "serious" || v.impact === "critical");
  expect(
    bad.map((v) => `${v.impact}: ${v.id} — ${v.help} (${v.nodes.map((n) => n.target.join(" ")).slice(0, 3).join("; ")})`),
    `accessibility of ${what}`,
  ).toEqual([]);
}

/** Keeps a screenshot of `page` as it was when the running test failed (<name>-failed-<width>.png). */
export function screenshotOnFailure(page: Page, name: string) {
  onTestFailed(async () => {
    if (!page.isClosed()) await screenshot(page, `${name}-failed`).catch(() => undefined);
  });
}
