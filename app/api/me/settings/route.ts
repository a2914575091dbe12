import { getUserSettings, setUserSettings } from "@/db/queries/people";
import { userSettingsSchema } from "@/lib/schemas/me";
import { parseJsonBody, route } from "@/lib/server/http";
import { requireUser } from "@/lib/server/session";

export const GET = route(async (request) => {
  const user = await requireUser(request.headers);
  return Response.json({ settings: await getUserSettings({ userId: user.id }) });
});

/** The signed-in person's own settings (°C or °F), the same in every site. */
export const PUT = route(async (request) => {
  const body = await parseJsonBody(request, userSettingsSchema);
  const user = await requireUser(request.headers);
  return Response.json({ settings: await setUserSettings({ userId: user.id, settings: body }) });
});
