// The owner invites someone by e-mail; the message is read from the local mail sink's
// page, and the invitee opens the link on a phone, makes an account and joins.
import { randomUUID } from "node:crypto";
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

const owner = DEMO_MEMBERS.find((m) => m.role === "owner")!;

describe("an invitation", () => {
  it("is sent by the owner, read from the sink and accepted by a newcomer", async () => {
    const email = `newcomer-${randomUUID().slice(0, 8)}@fernhollow.example`;
    const page = await newPage(browser, "desk");
    screenshotOnFailure(page, "invitation");
    await signIn(page, owner.email, owner.password);
    await page.getByRole("navigation", { name: "Site sections" }).getByRole("link", { name: "Members" }).click();
    await page.getByLabel("E-mail address").fill(email);
    await page.getByRole("radio", { name: /Helper/ }).check();
    await page.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => page.getByText(`Invitation sent to ${email}`).count()).toBe(1);
    // …and it is listed among the open invitations.
    await expect.poll(() => page.getByText(email, { exact: true }).count()).toBeGreaterThan(0);
    await screenshot(page, "owner-invites");

    await page.goto("/dev/mail");
    await page.getByRole("link", { name: new RegExp(email) }).first().click();
    const link = await page.getByRole("link", { name: /\/invitations\// }).first().getAttribute("href");
    expect(link).toMatch(/\/invitations\/[A-Za-z0-9_-]{43}$/);

    const phone = await newPage(browser, "phone");
    await phone.context().clearCookies();
    await phone.goto(new URL(link!).pathname);
    await screenshot(phone, "invitation-open");
    await expectAccessible(phone, "the invitation page");
    await phone.getByLabel("Your name").fill("Ivo Newcomer");
    await phone.getByLabel("Password").fill("a-long-enough-password");
    await phone.getByRole("button", { name: /Create account and join/ }).click();
    await phone.waitForURL(/\/sites\/[a-z0-9-]+$/);
    await expect.poll(() => phone.getByText("Helper", { exact: true }).count()).toBeGreaterThan(0);
    await screenshot(phone, "invitee-joined");

    // The link works once.
    await phone.context().clearCookies();
    await phone.goto(new URL(link!).pathname);
    await expect.poll(() => phone.getByText(/already been used|used/i).count()).toBeGreaterThan(0);
    await page.close();
    await phone.close();
  });
});
