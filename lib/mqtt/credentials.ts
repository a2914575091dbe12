// MQTT sign-in for devices and services: who is who (user names) and which topics
// each may use. The secrets themselves are made and checked in lib/server/device-secrets.ts.
import { SEGMENT, TOPIC_ROOT, type DeviceKind } from "./topics";

export type Principal =
  | { kind: "controller" }
  | { kind: "webapp" }
  | { kind: DeviceKind; site: string; device: string };

export const CONTROLLER_USERNAME = "cloche-controller";
export const WEBAPP_USERNAME = "cloche-webapp";

/** A device's MQTT user name: `{site}:{kind}:{device}`. */
export function deviceUsername(site: string, kind: DeviceKind, device: string) {
  return `${site}:${kind}:${device}`;
}

export function parseDeviceUsername(username: string): Principal | null {
  const [site, kind, device, ...rest] = username.split(":");
  if (rest.length || !site || !device || !SEGMENT.test(site) || !SEGMENT.test(device)) return null;
  if (kind !== "plug" && kind !== "sensor") return null;
  return { kind, site, device };
}

/** What a principal may publish to. */
export function mayPublish(who: Principal, topic: string) {
  switch (who.kind) {
    case "controller":
      return topic.startsWith(`${TOPIC_ROOT}/`);
    case "webapp":
      return /^cloche\/v1\/[a-z0-9-]+\/controller\/wake$/.test(topic);
    case "plug":
      return topic === `${TOPIC_ROOT}/${who.site}/plug/${who.device}/report` || topic === `${TOPIC_ROOT}/${who.site}/plug/${who.device}/presence`;
    case "sensor":
      return topic === `${TOPIC_ROOT}/${who.site}/sensor/${who.device}/reading`;
  }
}

/** Plug report and presence filters, for one site or device or with `+` in their place. */
const WEBAPP_FILTER = /^cloche\/v1\/(?:\+|[a-z0-9-]+)\/plug\/(?:\+|[a-z0-9-]+)\/(?:report|presence)$/;

/** What a principal may subscribe to (wildcards: the controller anywhere, the web app in place of a site or device). */
export function maySubscribe(who: Principal, filter: string) {
  switch (who.kind) {
    case "controller":
      return filter === `${TOPIC_ROOT}/#` || filter.startsWith(`${TOPIC_ROOT}/`);
    case "webapp":
      // The plugs' own reports and presence, so that a page learns at once that a plug
      // switched; never commands, readings or wake-ups.
      return WEBAPP_FILTER.test(filter);
    case "plug":
      return filter === `${TOPIC_ROOT}/${who.site}/plug/${who.device}/command`;
    case "sensor":
      return false;
  }
}
