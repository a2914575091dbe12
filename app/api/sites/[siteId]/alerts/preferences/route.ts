import { getMemberAlertPreferences } from "@/db/queries/alert-preferences";
import { saveMemberAlertPreferences } from "@/db/queries/alert-preference-changes";
import { alertPreferencesSchema } from "@/lib/alerts/preferences";
import { AppError } from "@/lib/errors";
import { siteParams } from "@/lib/schemas/site";
import { siteRoute } from "@/lib/server/site-route";

const loadMine = async ({ site }: { site: { id: string } }, userId: string) => {
  const member = await getMemberAlertPreferences({ siteId: site.id, userId });
  if (!member) throw new AppError("not_found", "You are no member of this site.");
  return member;
};

/** The signed-in member's own alert e-mails in this site (their role's defaults until they choose). */
export const GET = siteRoute({
  params: siteParams,
  action: "alerts.view",
  handle: async ({ site, user }) => {
    const { preferences, chosen } = await loadMine({ site }, user.id);
    return Response.json({ preferences, chosen });
  },
});

/** Every member, viewers too, chooses their own e-mails; frost risk always goes whatever they choose. */
export const PUT = siteRoute({
  params: siteParams,
  body: alertPreferencesSchema,
  action: "alerts.view",
  handle: async ({ site, user, body }) => {
    const member = await loadMine({ site }, user.id);
    return Response.json({ preferences: await saveMemberAlertPreferences({ siteId: site.id, member, preferences: body }), chosen: true });
  },
});
