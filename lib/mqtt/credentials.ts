// MQTT sign-in for devices and services. Device secrets are 32 random bytes, so a
// salted SHA-256 is enough to keep the stored form useless to a thief (slow password
// hashes protect low-entropy secrets people choose; these are not that), and the
// broker can check a thousand devices reconnecting at once without stalling.
import { createHash, randomBytes, timingSafeEqual } from "node:crypto";
import { SEGMENT, TOPIC_ROOT, type DeviceKind } from "./topics";

export type Principal =
  | { kind: "controller" }
  | { kind: "webapp" }
  | { kind: DeviceKind; site: string; device: string };

export const CONTROLLER_USERNAME = "cloche-controller";
export const WEBAPP_USERNAME = "cloche-webapp";

export function newDeviceSecret() {
  return randomBytes(32).toString("base64url");
}

export function hashDeviceSecret(secret: string, salt = randomBytes(16)) {
  const digest = createHash("sha256").update(salt).update(secret).digest();
  return `sha256$${salt.toString("base64url")}$${digest.toString("base64url")}`;
}

export function verifyDeviceSecret(secret: string, stored: string) {
  const [scheme, saltText, hashText] = stored.split("$");
  if (scheme !== "sha256" || !saltText || !hashText) return false;
  const expected = Buffer.from(hashText, "base64url");
  const actual = createHash("sha256").update(Buffer.from(saltText, "base64url")).update(secret).digest();
  return expected.length === actual.length && timingSafeEqual(expected, actual);
}

export function sameSecret(a: string, b: string) {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

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

/** What a principal may subscribe to (filters may hold wildcards only for the controller). */
export function maySubscribe(who: Principal, filter: string) {
  switch (who.kind) {
    case "controller":
      return filter === `${TOPIC_ROOT}/#` || filter.startsWith(`${TOPIC_ROOT}/`);
    case "webapp":
      return false;
    case "plug":
      return filter === `${TOPIC_ROOT}/${who.site}/plug/${who.device}/command`;
    case "sensor":
      return false;
  }
}
