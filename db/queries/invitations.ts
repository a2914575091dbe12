import "server-only";
import { and, asc, eq, isNull, sql } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { invitations, memberships, sites, user } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { INVITATION_REFUSALS, invitationExpiry, invitationMail, invitationState, type InvitationState } from "@/lib/invitations";
import { ROLE_LABELS, type Role } from "@/lib/permissions";
import type { InvitationInput } from "@/lib/schemas/members";
import { env } from "@/lib/server/env";
import { hashInvitationToken, invitationLink, newInvitationToken } from "@/lib/server/invitation-token";
import { sendMail } from "@/lib/server/mail";
import { recordAudit } from "./audit";
import { eqMember, lockSiteForMembers, type Tx } from "./site-lock";
import type { SiteWithRole } from "./sites";

export type Invitation = typeof invitations.$inferSelect;

/** An invitation as the owner sees it: never its token's hash. */
export type OpenInvitation = {
  id: string;
  email: string;
  role: Role;
  invitedBy: string | null;
  inviterName: string | null;
  createdAt: Date;
  expiresAt: Date;
  state: InvitationState;
};

const openColumns = {
  id: invitations.id,
  email: invitations.email,
  role: invitations.role,
  invitedBy: invitations.invitedBy,
  inviterName: user.name,
  createdAt: invitations.createdAt,
  expiresAt: invitations.expiresAt,
  acceptedAt: invitations.acceptedAt,
  withdrawnAt: invitations.withdrawnAt,
};

/** Invitations not yet used or withdrawn, pending or expired, oldest first. */
export async function getOpenInvitationsBySite({ siteId }: { siteId: string }, now = new Date()): Promise<OpenInvitation[]> {
  const rows = await getDb()
    .select(openColumns)
    .from(invitations)
    .leftJoin(user, eq(user.id, invitations.invitedBy))
    .where(and(eq(invitations.siteId, siteId), isNull(invitations.acceptedAt), isNull(invitations.withdrawnAt)))
    .orderBy(asc(invitations.createdAt));
  return rows.map(({ acceptedAt, withdrawnAt, ...row }) => ({ ...row, state: invitationState({ acceptedAt, withdrawnAt, expiresAt: row.expiresAt }, now) }));
}

export async function requireInvitation({ siteId, invitationId }: { siteId: string; invitationId: string }): Promise<Invitation> {
  const [row] = await getDb()
    .select()
    .from(invitations)
    .where(and(eq(invitations.id, invitationId), eq(invitations.siteId, siteId)))
    .limit(1);
  if (!row) throw new AppError("not_found", "No such invitation.");
  return row;
}

function toOpen(row: Invitation, inviterName: string | null, now: Date): OpenInvitation {
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    invitedBy: row.invitedBy,
    inviterName,
    createdAt: row.createdAt,
    expiresAt: row.expiresAt,
    state: invitationState(row, now),
  };
}

/** What the e-mail and the audit say about an invitation. */
const auditView = (row: Pick<Invitation, "email" | "role" | "expiresAt">) => ({ email: row.email, role: row.role, expiresAt: row.expiresAt.toISOString() });

async function mailInvitation(site: Pick<SiteWithRole, "name" | "timeZone">, inviterName: string, row: Pick<Invitation, "email" | "role" | "expiresAt">, token: string) {
  const label = ROLE_LABELS[row.role];
  await sendMail({
    to: row.email,
    ...invitationMail({
      siteName: site.name,
      inviterName,
      roleName: label.name,
      roleSummary: label.summary,
      link: invitationLink(env().BETTER_AUTH_URL, token),
      expiresAt: row.expiresAt,
      timeZone: site.timeZone,
    }),
  });
}

async function lockInvitation(tx: Tx, invitation: Invitation): Promise<Invitation> {
  const [row] = await tx.select().from(invitations).where(eq(invitations.id, invitation.id)).for("update");
  if (!row) throw new AppError("not_found", "No such invitation.");
  return row;
}

function assertOpen(row: Invitation, now: Date) {
  const state = invitationState(row, now);
  if (state === "accepted") throw new AppError("conflict", `${row.email} has already accepted this invitation.`);
  if (state === "withdrawn") throw new AppError("conflict", "This invitation was already withdrawn.");
}

/**
 * Invites `input.email` to the site. The mail goes out inside the transaction: when it
 * cannot be sent, no invitation is left behind whose link nobody received.
 */
export async function createInvitation({ site, inviter, input }: { site: SiteWithRole; inviter: { id: string; name: string }; input: InvitationInput }) {
  const now = new Date();
  return getDb().transaction(async (tx) => {
    await lockSiteForMembers(tx, { siteId: site.id, actorId: inviter.id, action: "members.manage" });
    const [member] = await tx
      .select({ id: memberships.id })
      .from(memberships)
      .innerJoin(user, eq(user.id, memberships.userId))
      .where(and(eq(memberships.siteId, site.id), eq(user.email, input.email)))
      .limit(1);
    if (member) throw new AppError("conflict", `${input.email} is already a member of ${site.name}.`, { email: "is already a member" });
    const [open] = await tx
      .select({ id: invitations.id })
      .from(invitations)
      .where(and(eq(invitations.siteId, site.id), eq(invitations.email, input.email), isNull(invitations.acceptedAt), isNull(invitations.withdrawnAt)))
      .limit(1);
    if (open) {
      throw new AppError("conflict", `${input.email} already has an open invitation: send that one again, or withdraw it first.`, {
        email: "already has an open invitation",
      });
    }
    const { token, hash } = newInvitationToken();
    const row: Invitation = {
      id: randomUUID(),
      siteId: site.id,
      email: input.email,
      role: input.role,
      tokenHash: hash,
      invitedBy: inviter.id,
      expiresAt: invitationExpiry(now),
      acceptedAt: null,
      acceptedBy: null,
      withdrawnAt: null,
      createdAt: now,
    };
    await tx.insert(invitations).values(row);
    await recordAudit(tx, { siteId: site.id, userId: inviter.id, action: "invitation.create", entityType: "invitation", entityId: row.id, after: auditView(row) });
    await mailInvitation(site, inviter.name, row, token);
    return toOpen(row, inviter.name, now);
  });
}

/** A fresh link (and expiry) for an open invitation; the old link stops working. */
export async function resendInvitation({ site, inviter, invitation }: { site: SiteWithRole; inviter: { id: string; name: string }; invitation: Invitation }) {
  const now = new Date();
  return getDb().transaction(async (tx) => {
    await lockSiteForMembers(tx, { siteId: site.id, actorId: inviter.id, action: "members.manage" });
    const row = await lockInvitation(tx, invitation);
    assertOpen(row, now);
    const { token, hash } = newInvitationToken();
    const next = { ...row, tokenHash: hash, expiresAt: invitationExpiry(now), invitedBy: inviter.id };
    await tx.update(invitations).set({ tokenHash: hash, expiresAt: next.expiresAt, invitedBy: inviter.id }).where(eq(invitations.id, row.id));
    await recordAudit(tx, {
      siteId: site.id,
      userId: inviter.id,
      action: "invitation.resend",
      entityType: "invitation",
      entityId: row.id,
      before: auditView(row),
      after: auditView(next),
    });
    await mailInvitation(site, inviter.name, next, token);
    return toOpen(next, inviter.name, now);
  });
}

export async function withdrawInvitation({ site, userId, invitation }: { site: SiteWithRole; userId: string; invitation: Invitation }) {
  const now = new Date();
  await getDb().transaction(async (tx) => {
    await lockSiteForMembers(tx, { siteId: site.id, actorId: userId, action: "members.manage" });
    const row = await lockInvitation(tx, invitation);
    assertOpen(row, now);
    await tx.update(invitations).set({ withdrawnAt: now }).where(eq(invitations.id, row.id));
    await recordAudit(tx, {
      siteId: site.id,
      userId,
      action: "invitation.withdraw",
      entityType: "invitation",
      entityId: row.id,
      before: { ...auditView(row), withdrawn: false },
      after: { ...auditView(row), withdrawn: true },
    });
  });
}

/** What the link's page shows: the site, the role, who invites, until when. */
export type InvitationView = {
  id: string;
  email: string;
  role: Role;
  state: InvitationState;
  expiresAt: Date;
  site: { id: string; name: string; slug: string; timeZone: string };
  inviterName: string | null;
};

export async function getInvitationByToken({ token }: { token: string }, now = new Date()): Promise<InvitationView | null> {
  const [row] = await getDb()
    .select({
      invitation: invitations,
      site: { id: sites.id, name: sites.name, slug: sites.slug, timeZone: sites.timeZone },
      inviterName: user.name,
    })
    .from(invitations)
    .innerJoin(sites, eq(sites.id, invitations.siteId))
    .leftJoin(user, eq(user.id, invitations.invitedBy))
    .where(eq(invitations.tokenHash, hashInvitationToken(token)))
    .limit(1);
  if (!row) return null;
  const { invitation } = row;
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    state: invitationState(invitation, now),
    expiresAt: invitation.expiresAt,
    site: row.site,
    inviterName: row.inviterName,
  };
}

/** True when someone already has an account under this e-mail address. */
export async function accountExists({ email }: { email: string }): Promise<boolean> {
  const [row] = await getDb().select({ n: sql<number>`1` }).from(user).where(eq(user.email, email)).limit(1);
  return Boolean(row);
}

/** Refuses an invitation that cannot be used (unknown, used, withdrawn, expired). */
export function assertUsable(invitation: Pick<InvitationView, "state"> | null): asserts invitation is Pick<InvitationView, "state"> {
  if (!invitation) throw new AppError("not_found", INVITATION_REFUSALS.unknown);
  if (invitation.state !== "pending") throw new AppError("conflict", INVITATION_REFUSALS[invitation.state]);
}

/**
 * The signed-in person joins the site with the invitation's role: the membership, the
 * invitation marked used and the audit entry in one transaction. The invitation's row
 * is locked first, so a link pressed twice at once joins once.
 */
export async function acceptInvitation({ token, person }: { token: string; person: { id: string; name: string; email: string } }) {
  const now = new Date();
  return getDb().transaction(async (tx) => {
    const [row] = await tx.select().from(invitations).where(eq(invitations.tokenHash, hashInvitationToken(token))).for("update");
    assertUsable(row ? { state: invitationState(row, now) } : null);
    const invitation = row!;
    if (invitation.email.toLowerCase() !== person.email.toLowerCase()) {
      throw new AppError(
        "forbidden",
        `This invitation is for ${invitation.email}, but you are signed in as ${person.email}. Sign out and open the link again to accept it as ${invitation.email}.`,
      );
    }
    const [site] = await tx.select({ id: sites.id, slug: sites.slug, name: sites.name }).from(sites).where(eq(sites.id, invitation.siteId)).for("update");
    if (!site) throw new AppError("not_found", INVITATION_REFUSALS.unknown);
    const [existing] = await tx.select({ role: memberships.role }).from(memberships).where(eqMember(site.id, person.id)).limit(1);
    if (existing) {
      throw new AppError("conflict", `You are already a member of ${site.name} (as ${ROLE_LABELS[existing.role].name}); this invitation is not needed.`);
    }
    await tx.insert(memberships).values({ id: randomUUID(), siteId: site.id, userId: person.id, role: invitation.role, createdAt: now, updatedAt: now });
    await tx.update(invitations).set({ acceptedAt: now, acceptedBy: person.id }).where(eq(invitations.id, invitation.id));
    await recordAudit(tx, {
      siteId: site.id,
      userId: person.id,
      action: "member.join",
      entityType: "member",
      entityId: person.id,
      after: { name: person.name, email: person.email, role: invitation.role },
    });
    return { site: { id: site.id, slug: site.slug, name: site.name }, role: invitation.role };
  });
}
