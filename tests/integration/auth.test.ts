import { describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, sites } from "@/db/schema";
import { auth, cookiesFrom, randomIp, signUp } from "../support/http";

async function getSession(cookie: string) {
  const response = await auth("/get-session", undefined, { method: "GET", cookie });
  expect(response.status).toBe(200);
  return (await response.json()) as { user: { email: string } } | null;
}

describe("sign-up", () => {
  it("creates the account and the grower's own site, with them as its owner", async () => {
    const account = await signUp({ siteName: "Upper Meadow Nursery", timeZone: "Pacific/Auckland", currency: "nzd" });
    const rows = await getDb()
      .select({ name: sites.name, timeZone: sites.timeZone, currency: sites.currency, slug: sites.slug, role: memberships.role })
      .from(memberships)
      .innerJoin(sites, eq(sites.id, memberships.siteId))
      .where(eq(memberships.userId, account.userId));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ name: "Upper Meadow Nursery", timeZone: "Pacific/Auckland", currency: "NZD", role: "owner" });
    expect(rows[0]!.slug).toMatch(/^upper-meadow-nursery/);
    expect((await getSession(account.cookie))?.user.email).toBe(account.email);
  });

  it("without site details, makes a site named after the grower", async () => {
    const account = await signUp();
    const [row] = await getDb()
      .select({ name: sites.name, timeZone: sites.timeZone })
      .from(memberships)
      .innerJoin(sites, eq(sites.id, memberships.siteId))
      .where(eq(memberships.userId, account.userId));
    expect(row).toEqual({ name: "Test Grower's houses", timeZone: "UTC" });
  });

  it("refuses a time zone that is not an IANA zone, and creates no account", async () => {
    const email = "nozone@test.example";
    const response = await auth("/sign-up/email", {
      email,
      password: "correct-horse-battery",
      name: "No Zone",
      timeZone: "Mars/Olympus_Mons",
    });
    expect(response.status).toBe(400);
    expect(((await response.json()) as { message: string }).message).toMatch(/timeZone/);
    const again = await auth("/sign-in/email", { email, password: "correct-horse-battery" });
    expect(again.status).toBe(401);
  });

  it("refuses a short password and a malformed email with a 400", async () => {
    const short = await auth("/sign-up/email", { email: "short@test.example", password: "abc", name: "Short" });
    expect(short.status).toBe(400);
    const malformed = await auth("/sign-up/email", { email: "not-an-email", password: "correct-horse-battery", name: "X" });
    expect(malformed.status).toBe(400);
  });
});

describe("sign-in and sign-out", () => {
  it("signs in with the right password and out again", async () => {
    const account = await signUp();
    const response = await auth("/sign-in/email", { email: account.email, password: account.password });
    expect(response.status).toBe(200);
    const cookie = cookiesFrom(response);
    expect(cookie).toMatch(/session_token=/);
    expect((await getSession(cookie))?.user.email).toBe(account.email);

    const out = await auth("/sign-out", {}, { cookie });
    expect(out.status).toBe(200);
    expect(await getSession(cookie)).toBeNull();
  });

  it("gives the same answer for a wrong password and for an account that does not exist", async () => {
    const account = await signUp();
    const wrong = await auth("/sign-in/email", { email: account.email, password: "wrong-password-123" });
    const unknown = await auth("/sign-in/email", { email: "nobody-here@test.example", password: "wrong-password-123" });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    const [a, b] = [(await wrong.json()) as { message: string }, (await unknown.json()) as { message: string }];
    expect(a.message).toBe(b.message);
    expect(a.message).toMatch(/invalid email or password/i);
  });

  it("rate-limits repeated sign-ins from one address", async () => {
    const ip = randomIp();
    const limit = Number(process.env.CLOCHE_SIGN_IN_LIMIT ?? 5);
    const statuses: number[] = [];
    for (let i = 0; i < limit + 1; i++) {
      const response = await auth("/sign-in/email", { email: "target@test.example", password: `guess-number-${i}` }, { ip });
      statuses.push(response.status);
    }
    expect(statuses.slice(0, limit).every((s) => s === 401)).toBe(true);
    expect(statuses[limit]).toBe(429);
    // Another address is not affected.
    const other = await auth("/sign-in/email", { email: "target@test.example", password: "guess" }, { ip: randomIp() });
    expect(other.status).toBe(401);
  });
});
