import { acceptInvitation } from "@/db/queries/invitations";
import { tokenParams } from "@/lib/schemas/members";
import { parseWith, route } from "@/lib/server/http";
import { requireUser } from "@/lib/server/session";

/**
 * The signed-in person accepts an invitation sent to their e-mail address. The checks
 * (unknown, used, withdrawn, expired, another address, already a member) happen with
 * the invitation's row locked, in the transaction that makes the membership.
 */
export const POST = route<{ token: string }>(async (request, rawParams) => {
  const { token } = parseWith(tokenParams, rawParams);
  const person = await requireUser(request.headers);
  const joined = await acceptInvitation({ token, person });
  return Response.json(joined);
});
