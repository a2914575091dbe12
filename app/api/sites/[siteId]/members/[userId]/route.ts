import { changeMemberRole, removeMember, requireMember } from "@/db/queries/members";
import { memberChangeSchema, memberParams } from "@/lib/schemas/members";
import { siteRoute } from "@/lib/server/site-route";

const loadMember = ({ site, params }: { site: { id: string }; params: { userId: string } }) =>
  requireMember({ siteId: site.id, userId: params.userId });

/** Changes a member's role; the site's last owner stays an owner (409). */
export const PATCH = siteRoute({
  params: memberParams,
  body: memberChangeSchema,
  action: "members.manage",
  load: loadMember,
  handle: async ({ site, user, params, body }) =>
    Response.json({ member: await changeMemberRole({ siteId: site.id, actorId: user.id, userId: params.userId, role: body.role }) }),
});

/** Removes a member from the site; the site's last owner cannot be removed (409). */
export const DELETE = siteRoute({
  params: memberParams,
  action: "members.manage",
  load: loadMember,
  handle: async ({ site, user, params }) => {
    await removeMember({ siteId: site.id, actorId: user.id, userId: params.userId });
    return new Response(null, { status: 204 });
  },
});
