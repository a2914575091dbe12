// Every page type, signed out and signed in, carries the security headers, and its
// content security policy breaks nothing: no violation while the page loads, hydrates
// and does one thing that needs its scripts (a chart drawn, a form checked, a stream
// opened, a client-side navigation). API answers, redirects and static files carry the
// fixed headers.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { APIResponse, Page, Response } from "playwright-core";
import { DEMO_MEMBERS, DEMO_SITE, demoId } from "@/db/seed";
import { newPage, openBrowser, screenshotOnFailure, signIn, type Browser } from "./support";

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
  // Before any page script: keep every CSP violation the page reports.
  await browser.context.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { __cspViolations: string[] }).__cspViolations = seen;
    document.addEventListener("securitypolicyviolation", (e) => seen.push(`${e.effectiveDirective} blocked ${e.blockedURI || "inline"} (${e.sourceFile}:${e.lineNumber})`));
  });
});
afterAll(async () => {
  await browser?.close();
});

const owner = DEMO_MEMBERS.find((m) => m.role === "owner")!;
const site = `/sites/${DEMO_SITE.slug}`;
const chartDrawn = async (page: Page) => {
  // uPlot is loaded after first paint (next/dynamic) and draws on a canvas.
  await expect.poll(() => page.locator("main canvas").count(), { timeout: 20_000 }).toBeGreaterThan(0);
};

/** What the page fetched since it was opened: URL paths with their status. */
type Fetched = string[];
type Visit = { name: string; path: string; status?: number; interact?: (page: Page, fetched: Fetched) => Promise<void> };

const signedOut: Visit[] = [
  {
    name: "sign-in",
    path: "/sign-in",
    // The form checks itself in the browser: an empty submit marks the e-mail field.
    interact: async (page) => {
      await page.getByRole("button", { name: "Sign in" }).click();
      await expect.poll(() => page.getByLabel("Email").getAttribute("aria-invalid")).toBe("true");
    },
  },
  { name: "sign-up", path: "/sign-up" },
  { name: "an invitation that is not valid", path: `/invitations/${"x".repeat(43)}` },
  {
    name: "not-found",
    path: "/no-such-page",
    status: 404,
    interact: async (page) => {
      await page.getByRole("link", { name: "Back to your houses" }).click();
      await page.waitForURL(/\/sign-in/);
    },
  },
  { name: "the development mailbox", path: "/dev/mail" },
];

const signedIn: Visit[] = [
  { name: "houses", path: site, interact: chartDrawn },
  { name: "a house", path: `${site}/houses/${demoId("house:glass")}` },
  { name: "schedules", path: `${site}/schedules` },
  { name: "a plug's schedule", path: `${site}/plugs/${demoId("plug:glass-heater")}/schedule` },
  {
    name: "a plug's override",
    path: `${site}/plugs/${demoId("plug:glass-heater")}/override`,
    // The page follows the plug through server-sent events (connect-src).
    interact: async (_page, fetched) => {
      await expect.poll(() => fetched.some((f) => /\/events 200$/.test(f)), { timeout: 10_000 }).toBe(true);
    },
  },
  { name: "devices", path: `${site}/devices` },
  { name: "the sensor history import", path: `${site}/devices/import` },
  { name: "members", path: `${site}/members` },
  { name: "activity", path: `${site}/activity` },
  { name: "settings", path: `${site}/settings` },
  { name: "history", path: `${site}/history` },
  { name: "reports", path: `${site}/reports` },
  { name: "degree-days", path: `${site}/reports/degree-days` },
  { name: "bills", path: `${site}/reports/bills` },
  { name: "tariffs", path: `${site}/reports/tariffs` },
  { name: "alerts", path: `${site}/alerts` },
  { name: "alert settings", path: `${site}/alerts/settings` },
  { name: "my alert e-mails", path: `${site}/alerts/mine` },
  { name: "an invitation that is not valid", path: `/invitations/${"x".repeat(43)}` },
  { name: "not-found", path: "/no-such-page", status: 404 },
  { name: "a site that is not there", path: "/sites/no-such-site", status: 404 },
];

/** The fixed headers, on everything the server answers. */
function expectFixedHeaders(headers: Record<string, string>, what: string) {
  expect(headers["x-content-type-options"], what).toBe("nosniff");
  expect(headers["x-frame-options"], what).toBe("DENY");
  expect(headers["referrer-policy"], what).toBe("same-origin");
  expect(headers["cross-origin-opener-policy"], what).toBe("same-origin");
  for (const feature of ["camera=()", "microphone=()", "geolocation=()"]) expect(headers["permissions-policy"], what).toContain(feature);
}

/** The page's policy: present, strict, and the nonce it names is the one on every script of the page. */
async function expectPolicy(page: Page, response: Response, what: string): Promise<string> {
  const headers = await response.allHeaders();
  expectFixedHeaders(headers, what);
  const policy = headers["content-security-policy"];
  expect(policy, `${what}: content-security-policy`).toBeTruthy();
  const directives = new Map(policy!.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...sources]) => [name!, sources]));
  const scripts = directives.get("script-src") ?? [];
  expect(scripts, what).not.toContain("'unsafe-eval'");
  expect(scripts, what).not.toContain("'unsafe-inline'");
  expect(policy, what).not.toContain("unsafe-eval");
  expect(directives.get("frame-ancestors"), what).toEqual(["'none'"]);
  expect(directives.get("object-src"), what).toEqual(["'none'"]);
  const nonce = scripts.map((s) => /^'nonce-(.+)'$/.exec(s)?.[1]).find(Boolean);
  expect(nonce, `${what}: a nonce in script-src`).toBeTruthy();
  // Next's inline scripts (the page's data and bootstrap) need it; files it loads are
  // trusted through them ('strict-dynamic').
  const inlineNonces = await page.evaluate(() => [...document.querySelectorAll("script:not([src])")].map((s) => (s as HTMLScriptElement).nonce));
  expect(inlineNonces.length, `${what}: inline scripts`).toBeGreaterThan(0);
  expect(new Set(inlineNonces), `${what}: every inline script carries the response's nonce`).toEqual(new Set([nonce]));
  return nonce!;
}

/** React has hydrated the page: its scripts ran under the policy. */
async function expectHydrated(page: Page, what: string) {
  await expect
    .poll(() => page.evaluate(() => [document.body, ...document.body.querySelectorAll("*")].some((el) => Object.keys(el).some((k) => k.startsWith("__reactFiber")))), {
      message: `${what} hydrated`,
    })
    .toBe(true);
}

async function visitAll(page: Page, visits: Visit[]) {
  const consoleErrors: string[] = [];
  page.on("console", (message) => {
    if (/Content.Security.Policy|Refused to|Permissions.Policy|Unrecognized feature/i.test(message.text())) consoleErrors.push(message.text());
  });
  const fetched: Fetched = [];
  page.on("response", (response) => fetched.push(`${new URL(response.url()).pathname} ${response.status()}`));
  const nonces = new Set<string>();
  for (const visit of visits) {
    consoleErrors.length = 0;
    fetched.length = 0;
    const response = await page.goto(visit.path);
    expect(response?.status(), visit.name).toBe(visit.status ?? 200);
    nonces.add(await expectPolicy(page, response!, visit.name));
    await expectHydrated(page, visit.name);
    await visit.interact?.(page, fetched);
    await page.waitForLoadState("networkidle").catch(() => undefined);
    expect(await page.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations), `${visit.name}: CSP violations`).toEqual([]);
    expect(consoleErrors, `${visit.name}: console`).toEqual([]);
  }
  // Fresh for every response.
  expect(nonces.size).toBe(visits.length);
}

const headersOf = (response: APIResponse) => response.headers();

describe("security headers", () => {
  it("are on every page signed out, and the policy breaks none of them", async () => {
    const page = await newPage(browser, "phone");
    screenshotOnFailure(page, "security-headers-signed-out");
    await page.context().clearCookies();
    await visitAll(page, signedOut);
    await page.close();
  });

  it("are on every page signed in, and the policy breaks none of them", async () => {
    const page = await newPage(browser, "desk");
    screenshotOnFailure(page, "security-headers-signed-in");
    await signIn(page, owner.email, owner.password);
    await visitAll(page, signedIn);
    await page.close();
  });

  it("are on API answers, the signed-out redirect and static files", async () => {
    const page = await newPage(browser, "desk");
    await page.context().clearCookies();
    const request = page.context().request;

    const health = await request.get("/api/health");
    expectFixedHeaders(headersOf(health), "/api/health");
    const refused = await request.get(`/api/sites/${DEMO_SITE.id}/live`);
    expect(refused.status()).toBe(401);
    expectFixedHeaders(headersOf(refused), "a refused API call");

    // The signed-in pages still send a signed-out person to sign in, before rendering.
    for (const path of ["/", site, `${site}/settings`]) {
      const redirect = await request.get(path, { maxRedirects: 0 });
      expect(redirect.status(), path).toBe(307);
      expect(new URL(redirect.headers().location!, "http://x").pathname, path).toBe("/sign-in");
      expectFixedHeaders(headersOf(redirect), `the redirect from ${path}`);
    }

    const signInPage = await page.goto("/sign-in");
    expect(signInPage?.status()).toBe(200);
    const assets = await page.evaluate(() => ({
      script: document.querySelector<HTMLScriptElement>("script[src*='/_next/static/']")?.src,
      stylesheet: document.querySelector<HTMLLinkElement>("link[rel=stylesheet][href*='/_next/static/']")?.href,
      icon: document.querySelector<HTMLLinkElement>("link[rel=icon]")?.href,
    }));
    for (const [kind, url] of Object.entries(assets)) {
      expect(url, `the sign-in page's ${kind}`).toBeTruthy();
      const file = await request.get(url!);
      expect(file.status(), url).toBe(200);
      expectFixedHeaders(headersOf(file), url!);
    }
    await page.close();
  });
});
