import { requireInvitation, resendInvitation } from "@/db/queries/invitations";
import { invitationParams } from "@/lib/schemas/members";
import { siteRoute } from "@/lib/server/site-route";

/** Sends an open invitation again with a fresh link and expiry; the old link stops working. */
export const POST = siteRoute({
  params: invitationParams,
  action: "members.manage",
  load: ({ site, params }) => requireInvitation({ siteId: site.id, invitationId: params.invitationId }),
  handle: async ({ site, user, loaded }) => Response.json({ invitation: await resendInvitation({ site, inviter: user, invitation: loaded }) }),
});
