import { z } from "zod";
import { ROLES } from "@/lib/domain";
import { INVITATION_TOKEN_PATTERN } from "@/lib/invitations";
import { email, password } from "./account";
import { line, recordId } from "./common";
import { siteParams } from "./site";

export const role = z.enum(ROLES, { error: `Role must be one of ${ROLES.join(", ")}` });

export const invitationSchema = z.object({ email, role });
export type InvitationInput = z.infer<typeof invitationSchema>;

export const invitationParams = siteParams.extend({ invitationId: recordId("invitation") });

export const memberParams = siteParams.extend({ userId: recordId("member") });

export const memberChangeSchema = z.object({ role });
export type MemberChange = z.infer<typeof memberChangeSchema>;

export const invitationToken = z
  .string({ error: "The invitation link must be text" })
  .regex(INVITATION_TOKEN_PATTERN, "This is not an invitation link");

export const tokenParams = z.object({ token: invitationToken });

/** An invited person's new account: the e-mail is the invitation's own, so it is not asked. */
export const inviteeSignUpSchema = z.object({ name: line("Name", 120), password });
export type InviteeSignUpInput = z.infer<typeof inviteeSignUpSchema>;
