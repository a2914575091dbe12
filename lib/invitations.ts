// The rules of an invitation link: its token's shape, its state at a moment, and what
// each state says to the person holding the link.
import { INVITATION_TTL_HOURS } from "./domain";

/** 32 random bytes in base64url, without padding. */
export const INVITATION_TOKEN_BYTES = 32;
export const INVITATION_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export type InvitationState = "pending" | "accepted" | "withdrawn" | "expired";

export type InvitationDates = { acceptedAt: Date | null; withdrawnAt: Date | null; expiresAt: Date };

/** Used and withdrawn outrank expired: the link says what happened to it first. */
export function invitationState(invitation: InvitationDates, now: Date): InvitationState {
  if (invitation.acceptedAt) return "accepted";
  if (invitation.withdrawnAt) return "withdrawn";
  if (invitation.expiresAt.getTime() <= now.getTime()) return "expired";
  return "pending";
}

export function invitationExpiry(now: Date): Date {
  return new Date(now.getTime() + INVITATION_TTL_HOURS * 3600_000);
}

/** What the link's holder is told when the link can no longer be used. */
export const INVITATION_REFUSALS: Record<Exclude<InvitationState, "pending"> | "unknown", string> = {
  accepted: "This invitation has already been used. Each link works once; ask the site's owner for a new one if you need it.",
  withdrawn: "This invitation was withdrawn by the site's owner. Ask them for a new one if you should still join.",
  expired: `This invitation has expired (links work for ${INVITATION_TTL_HOURS} hours). Ask the site's owner to send it again.`,
  unknown: "This invitation link is not known. Check that the whole link was copied, or ask the site's owner for a new one.",
};

export type InvitationMailFacts = {
  siteName: string;
  inviterName: string | null;
  roleName: string;
  roleSummary: string;
  link: string;
  expiresAt: Date;
  timeZone: string;
};

/** "Saturday, 14 March 2026 at 18:00 (Europe/London)": the site's wall clock, with its zone named. */
export function formatInSiteZone(at: Date, timeZone: string): string {
  const local = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    weekday: "long",
    day: "numeric",
    month: "long",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(at);
  return `${local} (${timeZone})`;
}

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

/** The invitation e-mail: who invites to which site with which role, the link, and its expiry. */
export function invitationMail(facts: InvitationMailFacts): { subject: string; text: string; html: string } {
  const who = facts.inviterName ?? "The owner";
  const until = formatInSiteZone(facts.expiresAt, facts.timeZone);
  const subject = `${who} invites you to ${facts.siteName} on Cloche`;
  const text = [
    `${who} invites you to join ${facts.siteName} on Cloche as ${facts.roleName}.`,
    `${facts.roleName}: ${facts.roleSummary}.`,
    "",
    "Open this link to accept:",
    facts.link,
    "",
    `The link works once and expires on ${until}.`,
    "If you did not expect this invitation, ignore this e-mail; nothing happens unless the link is opened and accepted.",
  ].join("\n");
  const html = [
    `<p>${escapeHtml(who)} invites you to join <strong>${escapeHtml(facts.siteName)}</strong> on Cloche as <strong>${escapeHtml(facts.roleName)}</strong>.</p>`,
    `<p>${escapeHtml(facts.roleName)}: ${escapeHtml(facts.roleSummary)}.</p>`,
    `<p><a href="${escapeHtml(facts.link)}">Accept the invitation</a></p>`,
    `<p>The link works once and expires on ${escapeHtml(until)}.</p>`,
    "<p>If you did not expect this invitation, ignore this e-mail; nothing happens unless the link is opened and accepted.</p>",
  ].join("\n");
  return { subject, text, html };
}
