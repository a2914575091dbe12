import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { AuthPanel } from "@/components/auth/AuthPanel";
import { SignOutButton } from "@/components/auth/SignOutButton";
import { AcceptButton, InviteeSignUp } from "@/components/invitations/AcceptInvitation";
import { buttonClasses } from "@/components/ui/Button";
import { Notice } from "@/components/ui/Notice";
import { accountExists, getInvitationByToken } from "@/db/queries/invitations";
import { getSiteForMember } from "@/db/queries/sites";
import { INVITATION_REFUSALS, INVITATION_TOKEN_PATTERN, formatInSiteZone } from "@/lib/invitations";
import { ROLE_LABELS } from "@/lib/permissions";
import { getSessionUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Invitation", referrer: "no-referrer" };

type Props = { params: Promise<{ token: string }> };

const link = "font-semibold text-leaf-700 underline-offset-2 hover:underline";

export default async function InvitationPage({ params }: Props) {
  const { token } = await params;
  const invitation = INVITATION_TOKEN_PATTERN.test(token) ? await getInvitationByToken({ token }) : null;
  const footer = (
    <Link href="/" className={link}>
      Go to Cloche
    </Link>
  );

  if (!invitation || invitation.state !== "pending") {
    return (
      <AuthPanel title="This link can’t be used" intro="Invitations to a site work once and for a limited time." footer={footer}>
        <Notice tone="caution">{INVITATION_REFUSALS[invitation ? (invitation.state as Exclude<typeof invitation.state, "pending">) : "unknown"]}</Notice>
      </AuthPanel>
    );
  }

  const role = ROLE_LABELS[invitation.role];
  const user = await getSessionUser(await headers());
  const already = user ? await getSiteForMember({ userId: user.id, siteId: invitation.site.id }) : null;

  let action;
  if (user && already) {
    action = (
      <div className="flex flex-col gap-3">
        <Notice>
          You are already a member of {invitation.site.name} (as {ROLE_LABELS[already.role].name}); this invitation is not needed.
        </Notice>
        <Link href={`/sites/${invitation.site.slug}`} className={buttonClasses("primary", "w-full")}>
          Open {invitation.site.name}
        </Link>
      </div>
    );
  } else if (user && user.email.toLowerCase() !== invitation.email) {
    action = (
      <div className="flex flex-col gap-3">
        <Notice tone="caution">
          This invitation is for {invitation.email}, but you are signed in as {user.email}. Sign out, then open the link again.
        </Notice>
        <SignOutButton className="w-full border border-frost-300" />
      </div>
    );
  } else if (user) {
    action = <AcceptButton token={token} siteName={invitation.site.name} />;
  } else if (await accountExists({ email: invitation.email })) {
    action = (
      <div className="flex flex-col gap-3">
        <p className="text-sm text-frost-700">You already have a Cloche account as {invitation.email}. Sign in, then accept here.</p>
        <Link href={`/sign-in?next=${encodeURIComponent(`/invitations/${token}`)}`} className={buttonClasses("primary", "w-full")}>
          Sign in to accept
        </Link>
      </div>
    );
  } else {
    action = <InviteeSignUp token={token} email={invitation.email} siteName={invitation.site.name} />;
  }

  return (
    <AuthPanel title={`Join ${invitation.site.name}`} intro={`${invitation.inviterName ?? "The owner"} invites ${invitation.email}.`} footer={footer}>
      <dl className="mb-6 grid grid-cols-[auto_1fr] gap-x-4 gap-y-2 text-sm">
        <dt className="font-medium text-frost-600">Site</dt>
        <dd className="text-frost-950">{invitation.site.name}</dd>
        <dt className="font-medium text-frost-600">Role</dt>
        <dd className="text-frost-950">
          <span className="font-semibold">{role.name}</span> — {role.summary}
        </dd>
        <dt className="font-medium text-frost-600">Invited by</dt>
        <dd className="text-frost-950">{invitation.inviterName ?? "the site’s owner"}</dd>
        <dt className="font-medium text-frost-600">Link expires</dt>
        <dd className="text-frost-950">{formatInSiteZone(invitation.expiresAt, invitation.site.timeZone)}</dd>
      </dl>
      {action}
    </AuthPanel>
  );
}
