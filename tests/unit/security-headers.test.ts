import { describe, expect, it } from "vitest";
import { contentSecurityPolicy, FIXED_SECURITY_HEADERS, makeNonce } from "@/lib/security-headers";

/** The policy as directive name → its sources. */
function directives(policy: string): Map<string, string[]> {
  const map = new Map<string, string[]>();
  for (const part of policy.split(";")) {
    const [name, ...sources] = part.trim().split(/\s+/);
    expect(map.has(name!), `${name} appears once`).toBe(false);
    map.set(name!, sources);
  }
  return map;
}

const nonce = "q83v2k5m9xTgPZ1s0aYbLw==";

describe("content security policy", () => {
  const production = directives(contentSecurityPolicy({ nonce, dev: false }));
  const dev = directives(contentSecurityPolicy({ nonce, dev: true }));

  it("lets scripts run only with the response's nonce, never eval or inline, outside next dev", () => {
    expect(production.get("script-src")).toEqual(["'self'", `'nonce-${nonce}'`, "'strict-dynamic'"]);
    const all = [...production.values()].flat();
    expect(all).not.toContain("'unsafe-eval'");
    expect(production.get("script-src")).not.toContain("'unsafe-inline'");
    expect(production.get("style-src")).toEqual(["'self'", `'nonce-${nonce}'`]);
  });

  it("allows eval only in next dev, for React's dev tooling, and keeps the nonce there", () => {
    expect(dev.get("script-src")).toEqual(["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", "'unsafe-eval'"]);
    expect(dev.get("script-src")).not.toContain("'unsafe-inline'");
  });

  it("refuses framing, plugins, other bases and other form targets", () => {
    for (const policy of [production, dev]) {
      expect(policy.get("frame-ancestors")).toEqual(["'none'"]);
      expect(policy.get("object-src")).toEqual(["'none'"]);
      expect(policy.get("base-uri")).toEqual(["'none'"]);
      expect(policy.get("form-action")).toEqual(["'self'"]);
      expect(policy.get("connect-src")).toEqual(["'self'"]);
      expect(policy.get("default-src")).toEqual(["'self'"]);
    }
  });

  it("is one header line Next can read the nonce from", () => {
    const policy = contentSecurityPolicy({ nonce, dev: false });
    expect(policy).not.toMatch(/[\r\n]/);
    // Next's own reading of the nonce (get-script-nonce-from-header.js) takes the
    // first 'nonce-…' source of script-src.
    expect(/script-src[^;]*'nonce-([A-Za-z0-9+/_-]+={0,2})'/.exec(policy)?.[1]).toBe(nonce);
  });

  it("refuses a nonce that is short, empty or could break out of the header", () => {
    for (const bad of ["", "abc", "short==", `${nonce}'; script-src *`, `${nonce}\r\nSet-Cookie: a=b`, "x".repeat(15)]) {
      expect(() => contentSecurityPolicy({ nonce: bad, dev: false }), JSON.stringify(bad)).toThrow(/nonce/);
    }
  });
});

describe("makeNonce", () => {
  it("is fresh each time and fits the policy", () => {
    const nonces = new Set(Array.from({ length: 200 }, () => makeNonce()));
    expect(nonces.size).toBe(200);
    for (const made of nonces) expect(() => contentSecurityPolicy({ nonce: made, dev: false })).not.toThrow();
    // 16 random bytes → 24 base64 characters.
    expect([...nonces].every((made) => made.length === 24)).toBe(true);
  });
});

describe("fixed security headers", () => {
  const headers = new Map(FIXED_SECURITY_HEADERS.map(({ key, value }) => [key.toLowerCase(), value]));

  it("sets nosniff, no framing, a referrer policy and the opener policy", () => {
    expect(headers.get("x-content-type-options")).toBe("nosniff");
    expect(headers.get("x-frame-options")).toBe("DENY");
    expect(headers.get("referrer-policy")).toBe("same-origin");
    expect(headers.get("cross-origin-opener-policy")).toBe("same-origin");
  });

  it("refuses camera, microphone and location to every frame", () => {
    const features = new Map(headers.get("permissions-policy")!.split(",").map((part) => part.trim().split("=") as [string, string]));
    for (const feature of ["camera", "microphone", "geolocation"]) expect(features.get(feature)).toBe("()");
  });
});
