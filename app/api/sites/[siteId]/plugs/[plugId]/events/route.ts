import { requirePlugOfSite } from "@/db/queries/overrides";
import { eventStream } from "@/lib/server/event-stream";
import { latestPlugEvents, onPlugEvent, plugEventsReady } from "@/lib/server/plug-events";
import { siteRoute } from "@/lib/server/site-route";
import { plugParams } from "@/lib/schemas/override";

// A stream, never cached or rendered ahead.
export const dynamic = "force-dynamic";

/**
 * The plug's own reports and presence as server-sent events, as the web app's one MQTT
 * subscription hears them: first `hello` (whether the subscription is live, and the
 * latest report and presence heard), then `report` and `presence` as they come.
 */
export const GET = siteRoute({
  params: plugParams,
  action: "site.view",
  load: ({ site, params }) => requirePlugOfSite({ siteId: site.id, plugId: params.plugId }),
  handle: async ({ request, site, loaded: plug }) => {
    const live = await plugEventsReady();
    return eventStream(request.signal, (send) => {
      send({ event: "hello", data: { live, serverNow: Date.now(), ...latestPlugEvents(site.slug, plug.deviceId) } });
      return onPlugEvent(site.slug, plug.deviceId, (e) => send({ event: e.type, data: e }));
    });
  },
});
