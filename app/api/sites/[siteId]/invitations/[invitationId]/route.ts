import { requireInvitation, withdrawInvitation } from "@/db/queries/invitations";
import { invitationParams } from "@/lib/schemas/members";
import { siteRoute } from "@/lib/server/site-route";

/** Withdraws an open invitation: its link stops working. */
export const DELETE = siteRoute({
  params: invitationParams,
  action: "members.manage",
  load: ({ site, params }) => requireInvitation({ siteId: site.id, invitationId: params.invitationId }),
  handle: async ({ site, user, loaded }) => {
    await withdrawInvitation({ site, userId: user.id, invitation: loaded });
    return new Response(null, { status: 204 });
  },
});
