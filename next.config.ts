import type { NextConfig } from "next";
import { FIXED_SECURITY_HEADERS } from "./lib/security-headers";

const nextConfig: NextConfig = {
  // mysql2 loads optional native bits at run time, and pdfkit reads its font metrics
  // from its own folder: bundling either breaks that.
  serverExternalPackages: ["mysql2", "pdfkit"],
  poweredByHeader: false,
  // The content security policy comes from proxy.ts (it needs a nonce per request).
  async headers() {
    return [{ source: "/:path*", headers: [...FIXED_SECURITY_HEADERS] }];
  },
};

export default nextConfig;
