// The security headers of every response: the content security policy (per request,
// with a nonce: proxy.ts) and the fixed ones (next.config.ts, on every path including
// /api and /_next/static).

/** A nonce as CSP's nonce-source takes it (base64 or base64url), long enough not to be guessed. */
const NONCE = /^[A-Za-z0-9+/_-]{16,}={0,2}$/;

export type PolicyOptions = {
  /** Fresh for every request (`makeNonce()`); Next copies it onto its own inline scripts. */
  nonce: string;
  /** `next dev`: React's dev tooling needs eval and Next injects unnonced styles. */
  dev: boolean;
};

/** 16 random bytes, base64: a fresh nonce for one response. */
export function makeNonce(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return btoa(String.fromCharCode(...bytes));
}

/**
 * The Content-Security-Policy value for a page. Scripts run only with this response's
 * nonce (and what those scripts load: 'strict-dynamic', for the chunks Next loads on
 * demand such as the charts). Style elements need the nonce too, except in `next dev`;
 * style attributes are allowed (`style-src-attr 'unsafe-inline'`) because the charts,
 * bars and week grids size themselves with React `style={…}` — an injected style
 * attribute cannot run script or select other elements.
 */
export function contentSecurityPolicy({ nonce, dev }: PolicyOptions): string {
  if (!NONCE.test(nonce)) throw new Error(`A CSP nonce must be at least 16 base64 characters; got ${JSON.stringify(nonce)}`);
  const directives: [string, ...string[]][] = [
    ["default-src", "'self'"],
    ["script-src", "'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(dev ? ["'unsafe-eval'"] : [])],
    dev ? ["style-src", "'self'", "'unsafe-inline'"] : ["style-src", "'self'", `'nonce-${nonce}'`],
    ["style-src-attr", "'unsafe-inline'"],
    ["img-src", "'self'", "data:", "blob:"],
    ["font-src", "'self'"],
    // Fetches, swr and the override page's server-sent events go to this origin only.
    ["connect-src", "'self'"],
    ["object-src", "'none'"],
    ["base-uri", "'none'"],
    ["form-action", "'self'"],
    ["frame-src", "'none'"],
    ["frame-ancestors", "'none'"],
  ];
  return directives.map((directive) => directive.join(" ")).join("; ");
}

/**
 * The headers every response carries, whatever it is. `same-origin` referrers because
 * invitation links carry their token in the path; the permissions are ones Cloche never
 * uses, refused for every frame.
 */
export const FIXED_SECURITY_HEADERS: ReadonlyArray<{ key: string; value: string }> = [
  { key: "Referrer-Policy", value: "same-origin" },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  {
    key: "Permissions-Policy",
    value: ["accelerometer", "camera", "geolocation", "gyroscope", "magnetometer", "microphone", "payment", "usb"]
      .map((feature) => `${feature}=()`)
      .join(", "),
  },
];
