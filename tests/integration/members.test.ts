// Members by invitation, through the real handlers, MariaDB and the local mail sink.
import { randomUUID } from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, invitations, memberships, user } from "@/db/schema";
import { waitForMail } from "@/lib/server/mailbox";
import { INVITATION_REFUSALS } from "@/lib/invitations";
import { hashInvitationToken } from "@/lib/server/invitation-token";
import * as sitesRoute from "@/app/api/sites/route";
import * as membersRoute from "@/app/api/sites/[siteId]/members/route";
import * as invitationsRoute from "@/app/api/sites/[siteId]/invitations/route";
import * as invitationRoute from "@/app/api/sites/[siteId]/invitations/[invitationId]/route";
import * as resendRoute from "@/app/api/sites/[siteId]/invitations/[invitationId]/resend/route";
import * as memberRoute from "@/app/api/sites/[siteId]/members/[userId]/route";
import * as acceptRoute from "@/app/api/invitations/[token]/accept/route";
import { auth, call, cookiesFrom, signUp, type Account } from "../support/http";

const mailFolder = process.env.CLOCHE_MAIL_SINK_DIR!;

type Json = Record<string, unknown>;
const json = async (r: Response) => (await r.json()) as Json;
const errorOf = async (r: Response) => ((await r.json()) as { error: { code: string; message: string } }).error;

async function siteOf(account: Account): Promise<string> {
  const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: account.cookie });
  return ((await response.json()) as { sites: { id: string }[] }).sites[0]!.id;
}

const newEmail = (who: string) => `${who}-${randomUUID().slice(0, 8)}@test.example`;

async function invite(owner: Account, siteId: string, email: string, role = "grower") {
  const since = new Date();
  const response = await call(invitationsRoute.POST, { method: "POST", path: "/x", params: { siteId }, body: { email, role }, cookie: owner.cookie });
  expect(response.status, await response.clone().text()).toBe(201);
  const { invitation } = (await response.json()) as { invitation: { id: string; state: string } };
  const mail = await waitForMail(mailFolder, { to: email, since });
  const token = /\/invitations\/([A-Za-z0-9_-]{43})/.exec(mail.text)?.[1];
  expect(token, mail.text).toBeDefined();
  return { invitation, mail, token: token! };
}

const accept = (token: string, cookie?: string) => call(acceptRoute.POST, { method: "POST", path: `/api/invitations/${token}/accept`, params: { token }, cookie });

/** Signs up through better-auth with the invitation's token: an account, no site. */
async function signUpInvited(email: string, token: string, extra: Json = {}) {
  const response = await auth("/sign-up/email", { email, password: "correct-horse-battery", name: "Invited Person", invitationToken: token, ...extra });
  return { response, cookie: cookiesFrom(response) };
}

async function snapshot(siteId: string) {
  const db = getDb();
  return {
    members: await db.select().from(memberships).where(eq(memberships.siteId, siteId)),
    invitations: await db.select().from(invitations).where(eq(invitations.siteId, siteId)),
    audit: (await db.select({ n: sql<number>`COUNT(*)`.mapWith(Number) }).from(auditLog).where(eq(auditLog.siteId, siteId)))[0]!.n,
  };
}

let owner: Account;
let siteId: string;

beforeAll(async () => {
  owner = await signUp({ siteName: "Invitation Nursery", timeZone: "Europe/Berlin" });
  siteId = await siteOf(owner);
});

describe("inviting by e-mail", () => {
  it("sends a mail that names the inviter, site, role, link and expiry; only the token's hash is stored", async () => {
    const email = newEmail("mail");
    const { invitation, mail, token } = await invite(owner, siteId, email, "helper");
    expect(invitation.state).toBe("pending");
    expect(mail.subject).toBe(`${owner.name} invites you to Invitation Nursery on Cloche`);
    expect(mail.text).toContain("as Helper");
    expect(mail.text).toContain(`http://127.0.0.1:3000/invitations/${token}`);
    expect(mail.text).toMatch(/expires on .*\(Europe\/Berlin\)/);
    expect(mail.html).toContain(`href="http://127.0.0.1:3000/invitations/${token}"`);
    const [row] = await getDb().select().from(invitations).where(eq(invitations.id, invitation.id));
    expect(row!.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(row!.tokenHash).not.toContain(token);
    // INVITATION_TTL_HOURS (72) from now.
    expect(Math.abs(row!.expiresAt.getTime() - row!.createdAt.getTime() - 72 * 3600_000)).toBeLessThan(2000);
    const listed = await call(invitationsRoute.GET, { path: "/x", params: { siteId }, cookie: owner.cookie });
    const open = ((await listed.json()) as { invitations: Json[] }).invitations;
    expect(open.find((i) => i.id === invitation.id)).toMatchObject({ email, role: "helper", state: "pending", inviterName: owner.name });
    expect(JSON.stringify(open)).not.toContain("tokenHash");
  });

  it("refuses bad input, a member's address and a second open invitation, writing nothing", async () => {
    const before = await snapshot(siteId);
    const post = (body: unknown) => call(invitationsRoute.POST, { method: "POST", path: "/x", params: { siteId }, body, cookie: owner.cookie });
    const badEmail = await post({ email: "not-an-address", role: "grower" });
    expect(badEmail.status).toBe(400);
    expect((await errorOf(badEmail)).message).toContain("Email must be an email address");
    const badRole = await post({ email: newEmail("x"), role: "gardener" });
    expect(badRole.status).toBe(400);
    expect((await errorOf(badRole)).message).toContain("Role must be one of");
    const self = await post({ email: owner.email, role: "grower" });
    expect(self.status).toBe(409);
    expect((await errorOf(self)).message).toContain("is already a member");
    expect(await snapshot(siteId)).toEqual(before);

    const email = newEmail("twice");
    await invite(owner, siteId, email);
    const again = await post({ email: email.toUpperCase(), role: "viewer" });
    expect(again.status).toBe(409);
    expect((await errorOf(again)).message).toContain("already has an open invitation");
  });
});

describe("accepting", () => {
  it("a new person creates an account on the link's page without a site of their own, then joins", async () => {
    const email = newEmail("new");
    const { invitation, token } = await invite(owner, siteId, email, "grower");
    const { response, cookie } = await signUpInvited(email, token);
    expect(response.status, await response.clone().text()).toBe(200);
    const [person] = await getDb().select().from(user).where(eq(user.email, email));
    expect(await getDb().select().from(memberships).where(eq(memberships.userId, person!.id))).toEqual([]);

    const accepted = await accept(token, cookie);
    expect(accepted.status).toBe(200);
    expect(await json(accepted)).toMatchObject({ site: { id: siteId }, role: "grower" });
    const [membership] = await getDb().select().from(memberships).where(eq(memberships.userId, person!.id));
    expect(membership).toMatchObject({ siteId, role: "grower" });
    const [row] = await getDb().select().from(invitations).where(eq(invitations.id, invitation.id));
    expect(row!.acceptedBy).toBe(person!.id);
    expect(row!.acceptedAt).not.toBeNull();
    const [entry] = await getDb().select().from(auditLog).where(and(eq(auditLog.siteId, siteId), eq(auditLog.action, "member.join"), eq(auditLog.entityId, person!.id)));
    expect(entry!.after).toMatchObject({ email, role: "grower" });

    const reused = await accept(token, cookie);
    expect(reused.status).toBe(409);
    expect((await errorOf(reused)).message).toBe(INVITATION_REFUSALS.accepted);
  });

  it("a person with an account joins with one press; they keep their own site too", async () => {
    const existing = await signUp({ siteName: "Their Own Plot" });
    const { token } = await invite(owner, siteId, existing.email, "viewer");
    const accepted = await accept(token, existing.cookie);
    expect(accepted.status).toBe(200);
    const response = await call(sitesRoute.GET, { path: "/api/sites", cookie: existing.cookie });
    const roles = ((await response.json()) as { sites: { id: string; role: string }[] }).sites.map((s) => s.role).sort();
    expect(roles).toEqual(["owner", "viewer"]);
  });

  it("refuses expired, used, withdrawn, replaced, unknown and malformed links with their messages, and writes nothing", async () => {
    const person = await signUp();
    const expired = await invite(owner, siteId, person.email);
    await getDb().update(invitations).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invitations.id, expired.invitation.id));
    let before = await snapshot(siteId);
    const late = await accept(expired.token, person.cookie);
    expect(late.status).toBe(409);
    expect((await errorOf(late)).message).toBe(INVITATION_REFUSALS.expired);
    expect(await snapshot(siteId)).toEqual(before);

    // Withdrawn: the owner takes it back; the link then says so.
    const withdrawn = await call(invitationRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, invitationId: expired.invitation.id }, cookie: owner.cookie });
    expect(withdrawn.status).toBe(204);
    before = await snapshot(siteId);
    const gone = await accept(expired.token, person.cookie);
    expect(gone.status).toBe(409);
    expect((await errorOf(gone)).message).toBe(INVITATION_REFUSALS.withdrawn);
    const twice = await call(invitationRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, invitationId: expired.invitation.id }, cookie: owner.cookie });
    expect(twice.status).toBe(409);
    expect(await snapshot(siteId)).toEqual(before);

    // Sent again: a fresh link; the old one is unknown from then on.
    const second = await invite(owner, siteId, person.email);
    const since = new Date();
    const resent = await call(resendRoute.POST, { method: "POST", path: "/x", params: { siteId, invitationId: second.invitation.id }, cookie: owner.cookie });
    expect(resent.status).toBe(200);
    const mail = await waitForMail(mailFolder, { to: person.email, since });
    const fresh = /\/invitations\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1]!;
    expect(fresh).not.toBe(second.token);
    before = await snapshot(siteId);
    const old = await accept(second.token, person.cookie);
    expect(old.status).toBe(404);
    expect((await errorOf(old)).message).toBe(INVITATION_REFUSALS.unknown);
    const malformed = await accept("not-a-token", person.cookie);
    expect(malformed.status).toBe(400);

    // Wrong address: someone else signed in cannot use the link.
    const stranger = await signUp();
    const wrong = await accept(fresh, stranger.cookie);
    expect(wrong.status).toBe(403);
    expect((await errorOf(wrong)).message).toContain(`This invitation is for ${person.email}, but you are signed in as ${stranger.email}`);
    expect(await snapshot(siteId)).toEqual(before);

    expect((await accept(fresh, person.cookie)).status).toBe(200);
  });

  it("tells someone who is already a member, and writes nothing", async () => {
    const person = await signUp();
    const first = await invite(owner, siteId, person.email, "helper");
    expect((await accept(first.token, person.cookie)).status).toBe(200);
    // An invitation made before they joined (inserted directly: the handler refuses members).
    const { token } = await invite(owner, siteId, newEmail("spare"));
    await getDb().update(invitations).set({ email: person.email }).where(eq(invitations.tokenHash, hashInvitationToken(token)));
    const before = await snapshot(siteId);
    const again = await accept(token, person.cookie);
    expect(again.status).toBe(409);
    expect((await errorOf(again)).message).toContain("You are already a member of Invitation Nursery (as Helper)");
    expect(await snapshot(siteId)).toEqual(before);
  });

  it("a sign-up with an invitation must use the invited address and a usable link; nothing is created otherwise", async () => {
    const email = newEmail("fixed");
    const { token } = await invite(owner, siteId, email);
    const other = newEmail("other");
    const wrong = await signUpInvited(other, token);
    expect(wrong.response.status).toBe(400);
    expect(((await wrong.response.json()) as { message: string }).message).toBe(`email: this invitation is for ${email}`);
    const unknown = await signUpInvited(email, "B".repeat(43));
    expect(unknown.response.status).toBe(400);
    expect(((await unknown.response.json()) as { message: string }).message).toBe(INVITATION_REFUSALS.unknown);
    expect(await getDb().select().from(user).where(eq(user.email, other))).toEqual([]);
    expect(await getDb().select().from(user).where(eq(user.email, email))).toEqual([]);
  });

  it("pressed twice at once, a link joins once", async () => {
    const email = newEmail("double");
    const { token } = await invite(owner, siteId, email);
    const { cookie } = await signUpInvited(email, token);
    const results = await Promise.all([accept(token, cookie), accept(token, cookie)]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    const [person] = await getDb().select().from(user).where(eq(user.email, email));
    expect(await getDb().select().from(memberships).where(and(eq(memberships.siteId, siteId), eq(memberships.userId, person!.id)))).toHaveLength(1);
  });
});

/** A new site with its owner and a member of `role` who joined by invitation. */
async function siteWithMember(role: string) {
  const siteOwner = await signUp({ siteName: "Roles Garden" });
  const id = await siteOf(siteOwner);
  const member = await signUp();
  const { token } = await invite(siteOwner, id, member.email, role);
  expect((await accept(token, member.cookie)).status).toBe(200);
  return { siteOwner, id, member };
}

const patchRole = (siteId: string, userId: string, role: string, cookie: string) =>
  call(memberRoute.PATCH, { method: "PATCH", path: "/x", params: { siteId, userId }, body: { role }, cookie });
const remove = (siteId: string, userId: string, cookie: string) => call(memberRoute.DELETE, { method: "DELETE", path: "/x", params: { siteId, userId }, cookie });

async function owners(siteId: string) {
  return getDb().select().from(memberships).where(and(eq(memberships.siteId, siteId), eq(memberships.role, "owner")));
}

describe("roles and removal", () => {
  it("the owner changes a role and removes a member; each change is audited with before and after", async () => {
    const { siteOwner, id, member } = await siteWithMember("helper");
    const listed = await call(membersRoute.GET, { path: "/x", params: { siteId: id }, cookie: siteOwner.cookie });
    const members = ((await listed.json()) as { members: Json[] }).members;
    expect(members.find((m) => m.userId === member.userId)).toMatchObject({ email: member.email, role: "helper", since: expect.any(String) });

    const changed = await patchRole(id, member.userId, "grower", siteOwner.cookie);
    expect(changed.status).toBe(200);
    expect(((await changed.json()) as { member: Json }).member).toMatchObject({ role: "grower" });
    const removed = await remove(id, member.userId, siteOwner.cookie);
    expect(removed.status).toBe(204);
    expect(await getDb().select().from(memberships).where(and(eq(memberships.siteId, id), eq(memberships.userId, member.userId)))).toEqual([]);
    const trail = await getDb().select().from(auditLog).where(and(eq(auditLog.siteId, id), eq(auditLog.entityId, member.userId)));
    expect(trail.map((t) => [t.action, t.before, t.after])).toEqual([
      ["member.join", null, { name: member.name, email: member.email, role: "helper" }],
      ["member.role", { name: member.name, email: member.email, role: "helper" }, { name: member.name, email: member.email, role: "grower" }],
      ["member.remove", { name: member.name, email: member.email, role: "grower" }, null],
    ]);
    // Gone from the site: the same id is now a 404.
    expect((await patchRole(id, member.userId, "viewer", siteOwner.cookie)).status).toBe(404);
  });

  it("a grower sees the members but changes nothing; a helper sees nothing (403); bad input is a 400", async () => {
    const { siteOwner, id, member } = await siteWithMember("grower");
    expect((await call(membersRoute.GET, { path: "/x", params: { siteId: id }, cookie: member.cookie })).status).toBe(200);
    const before = await snapshot(id);
    expect((await patchRole(id, siteOwner.userId, "viewer", member.cookie)).status).toBe(403);
    expect((await remove(id, siteOwner.userId, member.cookie)).status).toBe(403);
    expect((await call(invitationsRoute.GET, { path: "/x", params: { siteId: id }, cookie: member.cookie })).status).toBe(403);
    const bad = await patchRole(id, member.userId, "boss", siteOwner.cookie);
    expect(bad.status).toBe(400);
    expect((await patchRole(id, "not-an-id", "viewer", siteOwner.cookie)).status).toBe(400);
    expect(await snapshot(id)).toEqual(before);

    const helper = await siteWithMember("helper");
    expect((await call(membersRoute.GET, { path: "/x", params: { siteId: helper.id }, cookie: helper.member.cookie })).status).toBe(403);
  });

  it("withdraw and send again need members.manage (403 for a viewer, nothing changes)", async () => {
    const { siteOwner, id, member } = await siteWithMember("viewer");
    const { invitation } = await invite(siteOwner, id, newEmail("pending"));
    const before = await snapshot(id);
    const params = { siteId: id, invitationId: invitation.id };
    expect((await call(invitationRoute.DELETE, { method: "DELETE", path: "/x", params, cookie: member.cookie })).status).toBe(403);
    expect((await call(resendRoute.POST, { method: "POST", path: "/x", params, cookie: member.cookie })).status).toBe(403);
    expect(await snapshot(id)).toEqual(before);
  });

  it("the last owner can be neither demoted nor removed (409), and nothing is written", async () => {
    const { siteOwner, id } = await siteWithMember("grower");
    const before = await snapshot(id);
    const demote = await patchRole(id, siteOwner.userId, "grower", siteOwner.cookie);
    expect(demote.status).toBe(409);
    expect((await errorOf(demote)).message).toContain("is the site's only owner");
    const leave = await remove(id, siteOwner.userId, siteOwner.cookie);
    expect(leave.status).toBe(409);
    expect((await errorOf(leave)).message).toContain("cannot be removed");
    expect(await snapshot(id)).toEqual(before);
  });

  it("two owners stepping down at the same moment leave one owner", async () => {
    for (let round = 0; round < 3; round++) {
      const { siteOwner, id, member } = await siteWithMember("owner");
      const results = await Promise.all([
        patchRole(id, siteOwner.userId, "grower", siteOwner.cookie),
        patchRole(id, member.userId, "grower", member.cookie),
      ]);
      expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
      expect(await owners(id)).toHaveLength(1);
    }
  });

  it("two owners demoting or removing each other at the same moment leave one owner", async () => {
    for (const how of ["demote", "remove"] as const) {
      const { siteOwner, id, member } = await siteWithMember("owner");
      const act = (target: string, cookie: string) => (how === "demote" ? patchRole(id, target, "viewer", cookie) : remove(id, target, cookie));
      const results = await Promise.all([act(member.userId, siteOwner.cookie), act(siteOwner.userId, member.cookie)]);
      const statuses = results.map((r) => r.status).sort();
      // The second sees the first's change: it is no longer an owner (403) or its target is the last one (409).
      expect(statuses[0]).toBe(how === "demote" ? 200 : 204);
      expect([403, 404, 409]).toContain(statuses[1]);
      expect(await owners(id)).toHaveLength(1);
    }
  });

});
