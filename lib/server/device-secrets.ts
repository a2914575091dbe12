// Device and service MQTT secrets. They are 32 random bytes, so a salted SHA-256 is
// enough to keep the stored form useless to a thief (slow password hashes protect
// low-entropy secrets people choose; these are not that), and the broker can check a
// thousand devices reconnecting at once without stalling.
import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

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
