import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { INVITATION_TOKEN_BYTES } from "@/lib/invitations";

/** Only the hash is stored: a leaked table cannot be turned back into working links. */
export function hashInvitationToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

export function newInvitationToken(): { token: string; hash: string } {
  const token = randomBytes(INVITATION_TOKEN_BYTES).toString("base64url");
  return { token, hash: hashInvitationToken(token) };
}

/** The link in the e-mail: the page that shows the invitation and accepts it. */
export function invitationLink(baseUrl: string, token: string): string {
  return new URL(`/invitations/${token}`, baseUrl).toString();
}
