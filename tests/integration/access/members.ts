// Route cases of members, invitations, accepting an invitation and the audit trail.
import { DEMO_MEMBERS, demoId } from "@/db/seed";
import type { RouteCase } from "./case";
import * as invitationsRoute from "@/app/api/sites/[siteId]/invitations/route";
import * as invitationRoute from "@/app/api/sites/[siteId]/invitations/[invitationId]/route";
import * as resendRoute from "@/app/api/sites/[siteId]/invitations/[invitationId]/resend/route";
import * as memberRoute from "@/app/api/sites/[siteId]/members/[userId]/route";
import * as acceptRoute from "@/app/api/invitations/[token]/accept/route";
import * as auditRoute from "@/app/api/sites/[siteId]/audit/route";

const helper = demoId(`user:${DEMO_MEMBERS.find((m) => m.role === "helper")!.key}`);
/** No invitation has this id: the checks before the loader still answer 401 and 404, a viewer 404 too. */
const someInvitation = "00000000-0000-4000-8000-000000000001";
const someToken = "A".repeat(43);

export const cases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/invitations/route.ts", method: "GET", handler: invitationsRoute.GET, path: (i) => `/api/sites/${i.siteId}/invitations`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/invitations/route.ts", method: "POST", handler: invitationsRoute.POST, path: (i) => `/api/sites/${i.siteId}/invitations`, params: (i) => ({ siteId: i.siteId }), body: { email: "new-hand@test.example", role: "helper" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/members/[userId]/route.ts", method: "PATCH", handler: memberRoute.PATCH, path: (i) => `/api/sites/${i.siteId}/members/${helper}`, params: (i) => ({ siteId: i.siteId, userId: helper }), body: { role: "viewer" }, siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/members/[userId]/route.ts", method: "DELETE", handler: memberRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/members/${helper}`, params: (i) => ({ siteId: i.siteId, userId: helper }), siteScoped: true, write: true },
  { file: "app/api/sites/[siteId]/audit/route.ts", method: "GET", handler: auditRoute.GET, path: (i) => `/api/sites/${i.siteId}/audit`, params: (i) => ({ siteId: i.siteId }), siteScoped: true, write: false },
  { file: "app/api/invitations/[token]/accept/route.ts", method: "POST", handler: acceptRoute.POST, path: () => `/api/invitations/${someToken}/accept`, params: () => ({ token: someToken }), siteScoped: false, write: true },
];

/**
 * Handlers whose loader runs before the permission check: a viewer asking about an
 * invitation that does not exist gets 404, so these are checked for 401 and for other
 * sites here and for 403 in members.test.ts with a real invitation.
 */
export const invitationCases: RouteCase[] = [
  { file: "app/api/sites/[siteId]/invitations/[invitationId]/route.ts", method: "DELETE", handler: invitationRoute.DELETE, path: (i) => `/api/sites/${i.siteId}/invitations/${someInvitation}`, params: (i) => ({ siteId: i.siteId, invitationId: someInvitation }), siteScoped: true, write: false },
  { file: "app/api/sites/[siteId]/invitations/[invitationId]/resend/route.ts", method: "POST", handler: resendRoute.POST, path: (i) => `/api/sites/${i.siteId}/invitations/${someInvitation}/resend`, params: (i) => ({ siteId: i.siteId, invitationId: someInvitation }), siteScoped: true, write: false },
];
cases.push(...invitationCases);
