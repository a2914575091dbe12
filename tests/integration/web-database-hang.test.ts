// The web app when MariaDB hangs (as a stopped process does: connections accepted,
// nothing answered, nothing closed): every handler answers a clear 503 within a few
// seconds instead of waiting for as long as the database hangs, and serves again once
// it answers. The app's pool here goes through a proxy that can freeze.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as liveRoute from "@/app/api/sites/[siteId]/live/route";
import * as sitesRoute from "@/app/api/sites/route";
import * as healthRoute from "@/app/api/health/route";
import { NextRequest } from "next/server";
import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";
import { proxy as pageProxy } from "@/proxy";
import { BASE, auth, call, signUp, type Account } from "../support/http";
import { startTcpProxy, type TcpProxy } from "../support/tcp-proxy";

const TIMEOUT_MS = 1500;
let proxy: TcpProxy;
let owner: Account;
let siteId: string;

beforeAll(async () => {
  const url = new URL(process.env.DATABASE_URL!);
  proxy = await startTcpProxy({ host: url.hostname, port: Number(url.port) });
  url.host = `127.0.0.1:${proxy.port}`;
  // Read on the first use of the database in this file: everything goes through the proxy.
  process.env.DATABASE_URL = url.toString();
  process.env.CLOCHE_DB_TIMEOUT_MS = String(TIMEOUT_MS);
  owner = await signUp({ siteName: "Hang Test Garden" });
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: owner.cookie });
  siteId = ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
});

afterAll(async () => {
  proxy?.restore();
  await proxy?.close();
});

async function timed(run: () => Promise<Response>) {
  const started = performance.now();
  const response = await run();
  return { response, ms: performance.now() - started, body: (await response.json()) as Record<string, unknown> };
}

const live = () => call(liveRoute.GET, { path: `/api/sites/${siteId}/live`, params: { siteId }, cookie: owner.cookie });

describe("the web app while MariaDB hangs", () => {
  it("answers the live data with a 503 that says what is wrong, within a few seconds, then serves again", async () => {
    expect((await live()).status).toBe(200);
    proxy.freeze();
    try {
      const first = await timed(live);
      expect(first.response.status).toBe(503);
      expect(first.response.headers.get("retry-after")).toBe("30");
      expect(first.body).toEqual({ error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } });
      // The session lookup and the site's load each have the deadline: at most a few of them.
      expect(first.ms).toBeLessThan(3 * TIMEOUT_MS + 1000);

      // Once a deadline has passed, callers are told at once rather than each waiting one out.
      const again = await Promise.all(Array.from({ length: 20 }, () => timed(live)));
      for (const answer of again) expect(answer.response.status).toBe(503);
      expect(Math.max(...again.map((a) => a.ms))).toBeLessThan(TIMEOUT_MS + 1000);

      const health = await timed(() => healthRoute.GET());
      expect(health.response.status).toBe(503);
      expect(health.ms).toBeLessThan(TIMEOUT_MS + 1000);

      // Signing in needs the database too: the sign-in library's own 500 becomes the same 503.
      const signingIn = await auth("/sign-in/email", { email: owner.email, password: owner.password });
      expect(signingIn.status).toBe(503);
      expect(await signingIn.json()).toEqual({ error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } });

      // A page is answered before it renders: a 503 page that says what is wrong.
      const pageStarted = performance.now();
      const page = await pageProxy(new NextRequest(`${BASE}/sites/hang-test`, { headers: { cookie: owner.cookie } }));
      expect(performance.now() - pageStarted).toBeLessThan(3000);
      expect(page.status).toBe(503);
      expect(page.headers.get("content-type")).toMatch(/^text\/html/);
      expect(page.headers.get("retry-after")).toBe("30");
      const html = await page.text();
      expect(html).toContain("Cloche can’t reach its database");
      expect(html).toContain(DATABASE_UNAVAILABLE_MESSAGE);
      // Its one style element carries the policy's nonce, so the page looks as it should.
      const nonce = /'nonce-([^']+)'/.exec(page.headers.get("content-security-policy") ?? "")?.[1];
      expect(nonce).toBeTruthy();
      expect(html).toContain(`<style nonce="${nonce}">`);
    } finally {
      proxy.restore();
    }
    // Back: within a probe interval or two the database is tried again and answers.
    const started = Date.now();
    let status = 0;
    while (Date.now() - started < 10_000) {
      status = (await live()).status;
      if (status === 200) break;
      await new Promise((resolve) => setTimeout(resolve, 200));
    }
    expect(status).toBe(200);
    // Pages go through again once it answers.
    await new Promise((resolve) => setTimeout(resolve, 1100));
    const page = await pageProxy(new NextRequest(`${BASE}/sites/hang-test`, { headers: { cookie: owner.cookie } }));
    expect(page.status).toBe(200);
    expect(page.headers.get("x-middleware-next")).toBe("1");
  }, 30_000);

  it("answers a database that refuses connections with a 503 too, never a 500", async () => {
    proxy.cut();
    try {
      const answer = await timed(live);
      expect(answer.response.status).toBe(503);
      expect(answer.body).toMatchObject({ error: { code: "unavailable" } });
      expect(answer.ms).toBeLessThan(TIMEOUT_MS + 1000);
    } finally {
      proxy.restore();
    }
    const started = Date.now();
    let status = 0;
    while (Date.now() - started < 10_000 && status !== 200) status = (await live()).status;
    expect(status).toBe(200);
  }, 30_000);
});
