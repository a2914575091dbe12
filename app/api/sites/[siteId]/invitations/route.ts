import { createInvitation, getOpenInvitationsBySite } from "@/db/queries/invitations";
import { invitationSchema } from "@/lib/schemas/members";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

/** Invitations not yet used or withdrawn (pending or expired). */
export const GET = siteRoute({
  params: siteParams,
  action: "members.manage",
  handle: async ({ site }) => Response.json({ invitations: await getOpenInvitationsBySite({ siteId: site.id }) }),
});

/** Invites someone by e-mail with a role; the link goes out by mail, only its hash is kept. */
export const POST = siteRoute({
  params: siteParams,
  body: invitationSchema,
  action: "members.manage",
  handle: async ({ site, user, body }) =>
    Response.json({ invitation: await createInvitation({ site, inviter: user, input: body }) }, { status: 201 }),
});
